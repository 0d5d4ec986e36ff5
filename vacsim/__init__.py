"""vacsim: simulate a recirculating liquid-jet vacuum rig and plan runs on it."""

__version__ = "0.1.0"

__all__ = ["load_scenario", "simulate", "__version__"]


def __getattr__(name):  # lazy: keep `import vacsim` and `vacsim --help` fast
    if name == "load_scenario":
        from .scenario import load_scenario

        return load_scenario
    if name == "simulate":
        from .simulation import simulate

        return simulate
    raise AttributeError(name)
