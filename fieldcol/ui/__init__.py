"""The field app (Flet): phone-first screens over the site records store.

``model`` builds plain view-models from a store (no Flet); ``views`` renders them;
``app`` holds the routes, the handlers and ``run`` (web mode, served with no CDN).
"""
