"""shearcheck's hand-method library: what a careful engineer does on paper, exactly.

Pure functions over numpy/scipy; nothing here imports the FE harness, gmsh or scikit-fem.
Import the submodule you need (short shape names such as ``i`` or ``angle`` stay inside
their modules):

- ``classical.units``         length, force and stress units and conversions
- ``classical.sections``      polygon sections, exact Q and chord b, the shape registry
- ``classical.strips``        a cut of a 2D member as stacked strips
- ``classical.shear``         VQ/(Ib), V/A, F/(nA), pin bearing
- ``classical.bending``       Mc/I, von Mises, principal stresses
- ``classical.statics``       closed-form standard beam cases
- ``classical.beam1d``        statics of any support layout (1D frame)
- ``classical.thinwall``      thin-walled shear flow and shear centres
- ``classical.pins``          single/double shear short-member models
- ``classical.coefficients``  Cowper shear coefficients, hole stress concentrations
"""

__all__: list[str] = []
