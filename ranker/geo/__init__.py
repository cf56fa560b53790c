"""Positions of the corridors: places, lines, geodesic lengths, projection, GIS files.

- :mod:`.network` puts each corridor on the map: its drawn line from the
  ``Geometry`` sheet, or a straight line between the two places of its
  ``connects`` from the ``Places`` sheet.
- :mod:`.geodesic` measures lines on the WGS 84 ellipsoid (Karney 2013,
  through geographiclib).
- :mod:`.projection` projects longitude and latitude onto the map (Lambert
  azimuthal equal-area, centred on the network).
- :mod:`.importer` reads a GIS file of corridor lines for ``ranker template
  --from``; :mod:`.export` writes the ranked corridors as GeoJSON.
"""

from __future__ import annotations

from .network import Network, corridor_network

__all__ = ["Network", "corridor_network"]
