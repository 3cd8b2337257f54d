"""Flow around a spinning cylinder page (being built)."""

import streamlit as st

st.title("Flow around a spinning cylinder")
st.info("This page is being built.")
