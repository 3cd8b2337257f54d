"""Compare options page (being built)."""

import streamlit as st

st.title("Compare options")
st.info("This page is being built.")
