"""Overview page: what liftcore does and where to start."""

import streamlit as st

st.title("liftcore")
st.markdown(
    "Estimates of **lift, drag, thrust and power of spinning cylinders and spheres**, and what "
    "those forces are worth: rotor sails on ships, spinning balls in flight, and the ideal flow "
    "that explains both. Every page opens on an invented demo case; change any input in the "
    "sidebar. Units switch at the top of the sidebar."
)
c1, c2, c3, c4 = st.columns(4)
with c1:
    st.subheader("Rotor sails")
    st.page_link("views/rotor.py", label="Rotor sail on a ship", icon=":material/sailing:")
    st.page_link("views/voyage.py", label="Voyage savings", icon=":material/route:")
with c2:
    st.subheader("Spinning balls")
    st.page_link("views/flight.py", label="Spinning ball flight", icon=":material/sports_baseball:")
with c3:
    st.subheader("Theory and measurement")
    st.page_link("views/flow.py", label="Flow around a spinning cylinder", icon=":material/cyclone:")
    st.page_link("views/field.py", label="Circulation from a measured field", icon=":material/grid_on:")
with c4:
    st.subheader("Design reviews")
    st.page_link("views/compare.py", label="Compare options", icon=":material/compare:")
    st.caption("On any page: **Keep as option** to compare up to four side by side, "
               "**Handout report** for a self-contained HTML file, and **Save, load, share** for "
               "scenario files and a link that reopens the same view.")
st.divider()
st.caption(
    "Results are engineering estimates. Rotor sails change a ship's stability, structure and "
    "manoeuvring: defer to classification rules, flag-state requirements and a naval architect. "
    "Ball-flight results are for analysis, not for safety distances."
)
