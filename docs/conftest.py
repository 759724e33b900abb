# conf.py is Sphinx's configuration, not a module to doctest; _generated/ and _build/ are build output
collect_ignore = ["conf.py"]
collect_ignore_glob = ["_generated/*", "_build/*"]
