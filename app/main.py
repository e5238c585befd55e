"""Build the FastAPI application: ``create_app()`` includes one router per feature."""
from __future__ import annotations

from pathlib import Path

from fastapi import FastAPI
from fastapi.staticfiles import StaticFiles

import engine
from app.routers import api, designs, optimise, pages, studies
from app.schema import install_openapi

ROOT = Path(__file__).resolve().parents[1]


def create_app() -> FastAPI:
    app = FastAPI(title="Shaftwright", version=engine.__version__,
                  docs_url=None, redoc_url=None,  # /docs is served offline by app.routers.api
                  description="Shaft-and-bearing arrangement designer. Results inform preliminary "
                              "design only; verify with supplier data and a qualified engineer.")
    app.mount("/static", StaticFiles(directory=ROOT / "static"), name="static")
    for module in (pages, api, designs, studies, optimise):
        app.include_router(module.router)
    install_openapi(app)  # the API's bodies described by the engine's models (app/schema.py)
    return app
