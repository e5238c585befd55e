"""Router: api (placeholder until its feature lands)."""
from fastapi import APIRouter

router = APIRouter()
