"""The field app (Flet): phone-first screens over the site records store.

``model`` builds plain view-models from a store (no Flet) and ``notes`` those of a column's
findings, photos, history and retrofit options; ``views`` and ``notes_views`` render them;
``app`` holds the routes, the handlers and ``run`` (web mode, served with no CDN).
"""
