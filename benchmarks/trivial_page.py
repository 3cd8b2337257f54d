"""The trivial page bench_pages measures the dashboard against: one number input (in the sidebar,
like the dashboard's), one metric and one small Plotly chart that follows the input.

    streamlit run benchmarks/trivial_page.py
"""

import numpy as np
import plotly.graph_objects as go
import streamlit as st

st.set_page_config(page_title="trivial page", layout="wide")
st.title("Trivial page")
x = st.sidebar.number_input("A number", value=1.0, step=0.01, format="%.7g", key="trivial:x")
st.metric("The number squared", f"{x * x:.6g}")
t = np.linspace(0.0, 2.0 * np.pi, 50)
fig = go.Figure(go.Scatter(x=t, y=x * np.sin(t), mode="lines"))
fig.update_layout(height=300, margin=dict(l=40, r=20, t=20, b=40))
st.plotly_chart(fig, theme=None)
