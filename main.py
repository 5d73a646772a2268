"""Entry point of the device build (`flet build apk` / `flet build ipa`, configured in
pyproject.toml): the field app on the device's own store, in the app's data folder."""

import flet as ft

from fieldcol.ui.app import main

ft.run(main)
