"""The readers of the input tables, one module a part of the input (see
:mod:`calcreport.model.loader`, which calls them in order and collects their problems).
"""
