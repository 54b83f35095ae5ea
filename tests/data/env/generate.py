#!/usr/bin/env python3
# Writes the INVENTED coefficient tables of the fictional accommodation barge
# "Kestrel Deep 3" (cases/barge.yaml: 120 m x 36 m hull, Harrowmere field, all
# fictional).  The shapes are made up to look plausible; they are not
# measured and not computed by any hydrodynamic analysis: never use them
# for design.  Run from this directory: python3 generate.py
# The demo case reads copies in cases/barge/ (copy them again after a change).
import math

HDR = ("# INVENTED DATA for the fictional barge \"Kestrel Deep 3\" (cases/barge.yaml).\n"
       "# Made-up shapes for holdfast's tests and demo: not measured, not computed by\n"
       "# any hydrodynamic analysis.  Never use for design.  See generate.py.\n")
FREQS = [0.10, 0.15, 0.20, 0.25, 0.30, 0.35, 0.40, 0.45, 0.50, 0.55, 0.60, 0.70, 0.80,
         0.90, 1.00, 1.10, 1.20, 1.30, 1.40, 1.60, 1.80, 2.00, 2.50, 3.00, 3.50, 4.00, 5.00]
HEADS = list(range(0, 360, 30))


def rao(w, b):
    """Amplitudes per unit wave amplitude: surge, sway (m/m), yaw (deg/m)."""
    br = math.radians(b)
    surge = abs(math.cos(br)) / (1.0 + (w / 0.55) ** 4)
    sway = abs(math.sin(br)) / (1.0 + (w / 0.75) ** 4)
    yaw = abs(math.sin(2 * br)) * 0.9 * (w / 0.6) ** 2 / (1.0 + (w / 0.6) ** 4)
    return surge, sway, yaw


def drift(w, b):
    """Mean drift per wave amplitude squared: surge, sway (kN/m^2), yaw (kNm/m^2)."""
    br = math.radians(b)
    f = w ** 4 / (w ** 4 + 0.7 ** 4)  # rises to a reflection plateau
    return 90.0 * f * math.cos(br), 300.0 * f * math.sin(br), -1400.0 * f * math.sin(2 * br)


def coef(name, cx0, cy0, cm0):
    with open(name, "w") as o:
        o.write(HDR + "heading_deg,cx,cy,cmz\n")
        for b in HEADS:
            br = math.radians(b)
            o.write("%d,%.3f,%.3f,%.3f\n" % (b, cx0 * math.cos(br), cy0 * math.sin(br),
                                              cm0 * math.sin(2 * br)))


with open("barge-raos.csv", "w") as o:
    o.write(HDR + "frequency_rad_s,heading_deg,surge_m_per_m,sway_m_per_m,yaw_deg_per_m\n")
    for w in FREQS:
        for b in HEADS:
            o.write("%g,%d,%.4f,%.4f,%.4f\n" % ((w, b) + rao(w, b)))
with open("barge-drift.csv", "w") as o:
    o.write(HDR + "frequency_rad_s,heading_deg,surge_kN_per_m2,sway_kN_per_m2,yaw_kNm_per_m2\n")
    for w in FREQS:
        for b in HEADS:
            o.write("%g,%d,%.3f,%.3f,%.2f\n" % ((w, b) + drift(w, b)))
coef("barge-wind.csv", 0.62, 0.91, 0.085)
coef("barge-current.csv", 0.48, 0.83, 0.064)
