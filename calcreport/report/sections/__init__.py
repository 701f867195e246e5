"""The sections of the report, one module a part of it, each a mixin of the report builder
(:class:`calcreport.report.document._Report`), whose ``story`` lists them in reading order.
"""
