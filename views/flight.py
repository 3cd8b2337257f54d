"""Spinning ball flight page (being built)."""

import streamlit as st

st.title("Spinning ball flight")
st.info("This page is being built.")
