"""Build the FastAPI application: ``create_app()`` includes one router per feature."""
from __future__ import annotations

from contextlib import asynccontextmanager
from pathlib import Path

from fastapi import FastAPI
from fastapi.staticfiles import StaticFiles

import engine
from app import errors, security, work
from app.routers import access, api, designs, optimise, pages, studies
from app.schema import install_openapi

ROOT = Path(__file__).resolve().parents[1]


def create_app() -> FastAPI:
    app = FastAPI(title="Shaftwright", version=engine.__version__,
                  docs_url=None, redoc_url=None,  # /docs is served offline by app.routers.api
                  openapi_url=None,  # /openapi.json is app.routers.access's, behind the sign-in
                  description="Shaft-and-bearing arrangement designer. Results inform preliminary "
                              "design only; verify with supplier data and a qualified engineer.")
    app.mount("/static", StaticFiles(directory=ROOT / "static"), name="static")
    security.install(app)  # headers on every response; refusals answered in words
    for module in (pages, api, designs, studies, optimise, access):
        app.include_router(module.router, dependencies=[security.GUARD])  # who asks, may they
    install_openapi(app)  # the API's bodies described by the engine's models (app/schema.py)
    errors.install(app)  # one error policy for every route (app/errors.py)
    app.router.lifespan_context = _lifespan  # solve processes ready before the first edit
    return app


@asynccontextmanager
async def _lifespan(app: FastAPI):
    work.warm_up()
    yield
    work.shutdown()
