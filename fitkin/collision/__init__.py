"""Reduced collision integrals Ω(l,s)*(T*) computed from the potential by classical
scattering, tabulated, cached and interpolated; and published closed-form correlations.

Main entry point: :func:`reduced_collision_integral` (``potential, l, s, T_star``).
"""
from fitkin.collision.averages import compute_collision_integrals
from fitkin.collision.scattering import (ScatteringResolution, deflection_angle,
                                         hard_sphere_cross_section, orbiting_point,
                                         transport_cross_sections)
from fitkin.collision.tables import (TABLE_T_STAR_RANGE, CollisionTable, build_table,
                                     clear_memory_cache, collision_table,
                                     reduced_collision_integral)

__all__ = [
    "reduced_collision_integral",
    "collision_table",
    "CollisionTable",
    "build_table",
    "clear_memory_cache",
    "TABLE_T_STAR_RANGE",
    "compute_collision_integrals",
    "deflection_angle",
    "transport_cross_sections",
    "hard_sphere_cross_section",
    "orbiting_point",
    "ScatteringResolution",
]
