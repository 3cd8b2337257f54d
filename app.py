"""liftcore dashboard: routes to the pages in views/ (``streamlit run app.py``)."""

from pathlib import Path

import streamlit as st

from views import PAGES, inputs

# An emoji icon needs no download (a ":material/...:" page icon is fetched from a font server).
st.set_page_config(page_title="liftcore", page_icon="🌀", layout="wide")
here = Path(__file__).parent
pages = [st.Page(str(here / f), title=t, url_path=u, icon=i, default=(u == "overview"))
         for f, t, u, i in PAGES]
nav = st.navigation(pages)
inputs.sidebar_chrome()
nav.run()
