"""Pure functions with cited sources: no Cantera, no I/O, floats or arrays in and out.

mixtures        normalise, blend, stoichiometric oxygen, unburned mixture at phi
flame_measures  thicknesses and diffusivity of a computed flame profile
indicators      flashback, blowoff and quenching indicators from S_L and alpha_u
gasprops        ISO 6976:2016 heating values, relative density, Wobbe index
fits            power-law fits (Metghalchi & Keck)
limits          mechanism pressure ranges, flammability limits (range warnings)
emissions       dry basis, reference O2, mg/m3 and mg/kWh, residence time along a flame
sampling        grids of initial states a mechanism is sampled on, the validation points between them
"""
