"""Rotor sail on a ship page (being built)."""

import streamlit as st

st.title("Rotor sail on a ship")
st.info("This page is being built.")
