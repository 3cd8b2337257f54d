"""Voyage savings page (being built)."""

import streamlit as st

st.title("Voyage savings")
st.info("This page is being built.")
