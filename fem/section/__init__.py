"""The section kind (`kind = "section"`): a 2D cross-section under a shear force.

`mesh` (gmsh section meshes, shape registry) -> `solve` (Saint-Venant torsion and flexure
warping functions) -> `level` (one mesh level: FE against the hand shear) -> `check` (the
levels, convergence and the section's `Result`). `hand_only` is `shearcheck hand`.
"""
