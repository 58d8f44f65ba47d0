"""The language server's settings, parsed once from what an editor sends."""

from cognomen.server.settings import ServerSettings, parse_settings


def test_an_empty_list_is_no_settings_and_other_lists_are_reported():
    settings, problems = parse_settings([], ServerSettings(severity="warning"))
    assert problems == [] and settings.severity == "warning", "earlier settings are kept"
    settings, problems = parse_settings(["severity"])
    assert problems == ["cognomen settings must be an object, not list"]
    assert settings == ServerSettings()
