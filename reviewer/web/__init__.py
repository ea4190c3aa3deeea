"""``firstride serve``: a counter page where a build is filled in, reviewed, downloaded and signed.

Needs the ``web`` extra (Flask). :func:`reviewer.web.app.create_app` makes the application;
:mod:`reviewer.web.schema_form` turns the build file's JSON Schema into the form,
:mod:`reviewer.web.form_data` turns a submitted form back into a build tree, and
:mod:`reviewer.web.toml_text` writes that tree as TOML for the same loader the command line uses.
"""
