"""liftcore dashboard: routes to the pages in views/ (``streamlit run app.py``)."""

import gc
from pathlib import Path

import streamlit as st

from views import PAGES, inputs

# An emoji icon needs no download (a ":material/...:" page icon is fetched from a font server).
st.set_page_config(page_title="liftcore", page_icon="🌀", layout="wide")
here = Path(__file__).parent
# The home page lives at the root; the path it reserves is not its name, so that /overview (the
# name in the navigation) can be a hidden page that opens it.
pages = [st.Page(str(here / f), title=t, url_path="home" if u == "overview" else u, icon=i,
                 default=(u == "overview")) for f, t, u, i in PAGES]
home = next(p for p in pages if p.url_path == "")


def overview_address() -> None:
    """/overview, the home page's own name, opens the home page (which lives at the root)."""
    st.switch_page(home)


nav = st.navigation(pages + [st.Page(overview_address, title="Overview", url_path="overview",
                                     visibility="hidden")])
inputs.sidebar_chrome()
nav.run()
if not gc.get_freeze_count():
    # Streamlit collects garbage after every run; the modules and tables loaded once would be
    # scanned each time. Set them aside once, after the first page (CPython's gc.freeze).
    gc.collect()
    gc.freeze()
