"""Physics of a pumped transfer: pure functions on SI floats and numpy arrays.

One module per topic; each public function states its equation, the unit
of every parameter and its published source, and registers itself with
:mod:`calcreport.physics.equation` so the trace can print and recompute it.

water       liquid water properties (IAPWS-IF97, IAPWS 2008 viscosity)
atmosphere  barometric pressure (US Standard Atmosphere 1976)
friction    Reynolds number, flow regime, Darcy friction factor
losses      velocity, Darcy-Weisbach, minor and equipment losses
head        static, pressure and total dynamic head; NPSH available
power       hydraulic, shaft and electrical power; energy and cost
intake      submergence of the pump intake (ANSI/HI 9.8)
pump        pump curves, affinity laws, operating point, NPSH margin
route       pressure along the route: grade lines, maximum pressure
surge       surge screening: Korteweg wave speed, Joukowsky head rise
viscous     viscous correction of water pump curves (ANSI/HI 9.6.7)
valve       control valves for liquids: flow coefficient, choked drop (IEC 60534-2-1)
network     flows and heads of branched and looped networks (global gradient algorithm);
            a numerical method, not a traced equation: its solution is confirmed by the
            traced loss of every link at the solved flow
"""
