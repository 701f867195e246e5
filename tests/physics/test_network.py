"""The global gradient algorithm against independent solutions: a two-tank branch with a
demand and the three-reservoir junction solved in the test with scipy's root finder and
the Colebrook equation of the `fluids` library, a loop whose split symmetry fixes, and the
balances of a looped grid (mass at every junction, energy round every loop)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from calcreport.physics.network import NetworkError, darcy_links, gradient_solve

fluids = pytest.importorskip("fluids")
scipy_optimize = pytest.importorskip("scipy.optimize")

RHO, MU, G = 998.2, 1.002e-3, 9.80665  # water at 20 °C (IAPWS, rounded), standard gravity


def _loss(L, D, eps, K, Q):
    """Darcy-Weisbach with Colebrook by `fluids` (independent of calcreport's)."""
    A = math.pi * D**2 / 4
    v = abs(Q) / A
    Re = RHO * v * D / MU
    f = fluids.friction.Colebrook(Re, eps / D)
    return math.copysign((f * L / D + K) * v * v / (2 * G), Q)


def _flow(L, D, eps, K, dh):
    """The flow a pipe carries under a head difference dh (root of the loss)."""
    if dh == 0:
        return 0.0
    Q = scipy_optimize.brentq(lambda q: _loss(L, D, eps, K, q) - abs(dh), 1e-9, 10.0, xtol=1e-15)
    return math.copysign(Q, dh)


def test_two_tanks_and_a_demand_against_an_independent_solution():
    # Node 0: tank at 50 m; node 1: junction drawing 20 L/s; node 2: tank at 40 m.
    pipes = [(800.0, 0.2, 4.5e-5, 2.0), (600.0, 0.15, 4.5e-5, 1.0)]
    demand = 0.020
    loss = darcy_links(*zip(*pipes, strict=True), RHO, MU)
    sol = gradient_solve(3, {0: 50.0, 2: 40.0}, [0, 1], [1, 2], loss, [0.0, demand, 0.0])

    def imbalance(H):
        q1 = _flow(*pipes[0], 50.0 - H)
        q2 = _flow(*pipes[1], H - 40.0)
        return q1 - q2 - demand

    H = scipy_optimize.brentq(imbalance, 30.0, 50.0, xtol=1e-13)
    assert sol.head[1] == pytest.approx(H, abs=1e-7)
    assert sol.flow[0] == pytest.approx(_flow(*pipes[0], 50.0 - H), rel=1e-6)
    assert sol.flow[1] == pytest.approx(_flow(*pipes[1], H - 40.0), rel=1e-6)
    assert sol.mass_residual < 1e-12


def test_the_three_reservoir_junction():
    # The classic three-reservoir problem (as posed in White, Fluid Mechanics, 7th ed.,
    # sec. 6.9, from memory), with values of our own: reservoirs at 30, 18 and 9 m joined at
    # one junction; which way each pipe flows is an outcome.
    heads = {1: 30.0, 2: 18.0, 3: 9.0}
    pipes = [(1000.0, 0.3, 2.6e-4, 0.0), (1500.0, 0.25, 2.6e-4, 0.0), (2000.0, 0.2, 2.6e-4, 0.0)]
    loss = darcy_links(*zip(*pipes, strict=True), RHO, MU)
    sol = gradient_solve(4, heads, [1, 2, 3], [0, 0, 0], loss, [0.0] * 4)

    def imbalance(H):
        return sum(_flow(*p, heads[n] - H) for n, p in zip((1, 2, 3), pipes, strict=True))

    H = scipy_optimize.brentq(imbalance, 9.0, 30.0, xtol=1e-13)
    assert sol.head[0] == pytest.approx(H, abs=1e-7)
    for n, p, q in zip((1, 2, 3), pipes, sol.flow, strict=True):
        assert q == pytest.approx(_flow(*p, heads[n] - H), rel=1e-6, abs=1e-12)
    assert sol.flow[0] > 0 > sol.flow[2]  # the top reservoir feeds, the lowest receives


def test_a_symmetric_loop_splits_its_flow_evenly():
    # A tank feeds node 1; two identical pipes (one listed each way round) join it to node 2,
    # which draws 30 L/s: by symmetry each carries 15 L/s, whatever the friction.
    pipe = (300.0, 0.15, 4.5e-5, 0.5)
    links = [(0, 1), (1, 2), (2, 1)]
    loss = darcy_links(*zip((50.0, 0.3, 4.5e-5, 0.5), pipe, pipe, strict=True), RHO, MU)
    starts, ends = [a for a, _ in links], [b for _, b in links]
    sol = gradient_solve(3, {0: 40.0}, starts, ends, loss, [0.0, 0.0, 0.030])
    assert sol.flow[0] == pytest.approx(0.030, rel=1e-12)
    assert sol.flow[1] == pytest.approx(0.015, rel=1e-9)
    assert sol.flow[2] == pytest.approx(-0.015, rel=1e-9)
    # The heads follow the losses the independent Colebrook gives.
    assert sol.head[1] - sol.head[2] == pytest.approx(_loss(*pipe, 0.015), rel=1e-6)


def test_a_looped_grid_balances_mass_at_every_node_and_energy_round_every_loop():
    # A 6 x 6 grid of pipes (60 links, 25 loops) fed from one corner tank, a demand at every
    # other node: an arbitrary looped network.
    n = 6
    node = {(i, j): i * n + j + 1 for i in range(n) for j in range(n)}
    start, end = [0], [node[0, 0]]
    for (i, j), k in node.items():
        if j + 1 < n:
            start.append(k)
            end.append(node[i, j + 1])
        if i + 1 < n:
            start.append(k)
            end.append(node[i + 1, j])
    links = len(start)
    rng = np.random.default_rng(7)
    L = rng.uniform(100.0, 400.0, links)
    D = rng.choice([0.1, 0.15, 0.2], links)
    demand = np.r_[0.0, rng.uniform(0.0005, 0.003, n * n)]
    loss = darcy_links(L, D, np.full(links, 4.5e-5), np.zeros(links), RHO, MU)
    sol = gradient_solve(n * n + 1, {0: 60.0}, start, end, loss, demand)
    assert sol.mass_residual < 1e-10
    h, _ = loss(sol.flow)
    # Energy: each link's loss equals the head difference of its ends, so every loop closes.
    assert np.allclose(h, sol.head[start] - sol.head[end], atol=1e-9)
    assert sol.flow[0] == pytest.approx(demand.sum(), rel=1e-10)


def test_a_junction_cut_off_from_every_head_is_refused():
    loss = darcy_links([100.0], [0.1], [4.5e-5], [0.0], RHO, MU)
    with pytest.raises(NetworkError, match="nodes 1, 2 reach no fixed head"):
        gradient_solve(3, {0: 10.0}, [1], [2], loss, [0.0, 0.0, 0.001])
    with pytest.raises(NetworkError, match="fixed head"):
        gradient_solve(2, {}, [0], [1], loss, [0.0, 0.0])


CURVE_Q = [0.0, 0.01, 0.02, 0.03, 0.04, 0.05]  # a curve of our own, m^3/s and m
CURVE_H = [36.0, 35.4, 33.6, 30.4, 25.8, 19.6]


def _pchip(q, s=1.0):
    """The pump curve by scipy's PCHIP (independent of calcreport's monotone cubic)."""
    from scipy.interpolate import PchipInterpolator

    return s * s * float(PchipInterpolator(CURVE_Q, CURVE_H)(q / s))


def test_a_pump_between_two_tanks_runs_where_its_curve_meets_the_system():
    from calcreport.physics.network import joined, pump_link

    # Node 0: tank at 10 m; the pump lifts from it to node 1; a pipe to the tank at 30 m.
    pipe = (250.0, 0.15, 4.5e-5, 3.0)
    for s in (1.0, 0.9):  # at the curve's speed and at 90 % (affinity laws)
        loss = joined([([0], pump_link(CURVE_Q, CURVE_H, s)),
                       ([1], darcy_links(*zip(pipe, strict=True), RHO, MU))], 2)  # fmt: skip
        sol = gradient_solve(3, {0: 10.0, 2: 30.0}, [0, 1], [1, 2], loss, [0.0] * 3)
        Q = scipy_optimize.brentq(
            lambda q, s=s: _pchip(q, s) - 20.0 - _loss(*pipe, q), 1e-6, 0.05 * s, xtol=1e-14
        )
        assert sol.flow[0] == pytest.approx(Q, rel=1e-6)
        assert sol.head[1] == pytest.approx(10.0 + _pchip(Q, s), rel=1e-6)


def test_two_pumps_in_parallel_share_the_flow_of_their_combined_curve():
    from calcreport.physics.network import joined, pump_link

    pipe = (400.0, 0.2, 4.5e-5, 2.0)
    pump = pump_link(CURVE_Q, CURVE_H)
    loss = joined(
        [([0], pump), ([1], pump), ([2], darcy_links(*zip(pipe, strict=True), RHO, MU))], 3
    )
    sol = gradient_solve(3, {0: 10.0, 2: 32.0}, [0, 0, 1], [1, 1, 2], loss, [0.0] * 3)
    # The combined curve of two: Q at H is twice one pump's (Karassik 2008, parallel pumps).
    Q = scipy_optimize.brentq(
        lambda q: _pchip(q / 2) - 22.0 - _loss(*pipe, q), 1e-6, 0.1, xtol=1e-14
    )
    assert sol.flow[2] == pytest.approx(Q, rel=1e-6)
    assert sol.flow[0] == pytest.approx(Q / 2, rel=1e-6) and sol.flow[1] == pytest.approx(
        Q / 2, rel=1e-6
    )


def test_a_pump_against_more_than_its_shutoff_head_passes_no_flow_back():
    from calcreport.physics.network import joined, pump_link

    pipe = (100.0, 0.15, 4.5e-5, 1.0)
    loss = joined([([0], pump_link(CURVE_Q, CURVE_H)),
                   ([1], darcy_links(*zip(pipe, strict=True), RHO, MU))], 2)  # fmt: skip
    # The far tank stands 40 m above the near one, above the 36 m shutoff: the pump's
    # check valve holds, and only a closed link's leak (h / 1e8 s/m²) remains.
    sol = gradient_solve(3, {0: 0.0, 2: 40.0}, [0, 1], [1, 2], loss, [0.0] * 3)
    assert abs(sol.flow[0]) < 1e-7
