"""Circulation from a measured field page (being built)."""

import streamlit as st

st.title("Circulation from a measured field")
st.info("This page is being built.")
