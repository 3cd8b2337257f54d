"""Dashboard pages: one module per page. Pages read widgets, call liftcore, draw figures."""

#: (file, title, url path, icon) in navigation order. ``app.py`` builds the navigation from this.
PAGES = (
    ("views/home.py", "Overview", "overview", ":material/home:"),
    ("views/flow.py", "Flow around a spinning cylinder", "flow", ":material/cyclone:"),
    ("views/field.py", "Circulation from a measured field", "field", ":material/grid_on:"),
    ("views/rotor.py", "Rotor sail on a ship", "rotor", ":material/sailing:"),
    ("views/voyage.py", "Voyage savings", "voyage", ":material/route:"),
    ("views/flight.py", "Spinning ball flight", "flight", ":material/sports_baseball:"),
    ("views/compare.py", "Compare options", "compare", ":material/compare:"),
)
