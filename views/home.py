"""Overview page: what liftcore does and where to start."""

import streamlit as st

st.title("liftcore")
st.markdown(
    "Estimates of **lift, drag, thrust and power of spinning cylinders and spheres**, and what "
    "those forces are worth: rotor sails on ships, spinning balls in flight, and the ideal flow "
    "that explains both. Every page opens on an invented demo case; change any input in the "
    "sidebar. Units switch at the top of the sidebar."
)

#: (heading, [(page file, label, icon, what it answers)])
GROUPS = (
    ("Rotor sails", (
        ("views/rotor.py", "Rotor sail on a ship", ":material/sailing:",
         "Thrust, side force, heel and spin power in one wind, with every coefficient set."),
        ("views/voyage.py", "Voyage savings", ":material/route:",
         "Fuel, CO₂ and money over a year on a trade; which rotor size and how many."),
    )),
    ("Spinning balls", (
        ("views/flight.py", "Spinning ball flight", ":material/sports_baseball:",
         "Carry, height and curve with drag, Magnus lift, spin decay, wind and air; sweeps, "
         "spread and fits to tracked flights."),
    )),
    ("Theory and measurement", (
        ("views/flow.py", "Flow around a spinning cylinder", ":material/cyclone:",
         "The ideal flow and its Kutta-Joukowski lift, checked against the surface pressure."),
        ("views/field.py", "Circulation from a measured field", ":material/grid_on:",
         "Circulation and lift per span from a gridded velocity field."),
    )),
    ("Design reviews", (
        ("views/compare.py", "Compare options", ":material/compare:",
         "Up to four options side by side. On any page: Keep as option, Handout report, and "
         "Save, load, share (scenario files and a link that reopens the same view)."),
    )),
)

for row in (GROUPS[:2], GROUPS[2:]):
    for col, (heading, links) in zip(st.columns(2, gap="large"), row):
        with col:
            st.subheader(heading)
            for path, label, icon, what in links:
                st.page_link(path, label=label, icon=icon)
                st.caption(what)
st.divider()
st.caption(
    "Results are engineering estimates. Rotor sails change a ship's stability, structure and "
    "manoeuvring: defer to classification rules, flag-state requirements and a naval architect. "
    "Ball-flight results are for analysis, not for safety distances."
)
