"""Shaftwright web layer: FastAPI app, routers, store, plots and the printed note."""
