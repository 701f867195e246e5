"""Pipe networks: the flows in every link and the heads at every node of a branched or looped
network, by the global gradient algorithm of Todini and Pilati, on sparse matrices.

A network is nodes joined by links. A node's head is fixed (a vessel's surface) or unknown
(a junction, with its demand: the flow drawn off there). Each link runs from a node to a
node and loses head with its flow, h(Q), given by the caller with its slope: a pipe by
Darcy–Weisbach (:func:`darcy_links`), a pump as a negative loss (a gain) by its curve. The
algorithm solves together the energy equation of every link, H_from − H_to = h(Q), and the
mass balance of every junction, by Newton's method: each iteration solves one symmetric
positive-definite system for the unknown heads, A12ᵀ D⁻¹ A12 · H = F, then updates the flows
from them. Its solution satisfies every junction's balance to the solver's precision and
the energy balance round every loop, for any layout; a tree (branched network) is the case
without loops.

References
----------
1. Todini, E., and Pilati, S., "A gradient algorithm for the analysis of pipe networks",
   in Coulbeck, B., and Orr, C.-H. (eds.), Computer Applications in Water Supply, Vol. 1,
   Research Studies Press, Letchworth, 1988, pp. 1-20.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

import numpy as np

__all__ = [
    "NetworkError",
    "NetworkSolution",
    "darcy_links",
    "gradient_solve",
    "joined",
    "pump_link",
]

G = 9.80665  # m/s^2, standard gravity

# Least flow the slope of a loss is taken at: below it a pipe's slope dh/dQ (zero at Q = 0)
# would leave the head system singular; the loss itself stays exact.
_Q_FLOOR = 1e-9  # m^3/s


class NetworkError(ValueError):
    """A network the gradient method cannot solve (a junction cut off from every fixed
    head, or no convergence)."""


@dataclass(frozen=True)
class NetworkSolution:
    """The solved network: ``flow`` of each link [m^3/s] (positive from its first node to its
    second), ``head`` of each node [m], the iterations taken, the last relative change of
    the flows [-] and the largest junction imbalance [m^3/s]."""

    flow: np.ndarray
    head: np.ndarray
    iterations: int
    flow_change: float
    mass_residual: float


def gradient_solve(
    nodes: int,
    fixed: dict[int, float],
    start: Any,
    end: Any,
    head_loss: Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]],
    demand: Any,
    flow: Any = None,
    tolerance: float = 1e-10,
    max_iterations: int = 100,
) -> NetworkSolution:
    r"""Flows and heads of a network by the global gradient algorithm (Todini and Pilati).

    .. math::
        \left(A_{12}^T D^{-1} A_{12}\right) H = -q - A_{12}^T Q^k
        + A_{12}^T D^{-1}\left(h(Q^k) - A_{10} H_0\right),\qquad
        Q^{k+1} = Q^k - D^{-1}\left(h(Q^k) - A_{12} H - A_{10} H_0\right)

    with A the link-node incidence (+1 at a link's first node, −1 at its second), split into
    the columns of the unknown heads (A12) and of the fixed ones (A10), D = diag(dh/dQ) and
    q the junctions' demands.

    Parameters
    ----------
    nodes : int
        Number of nodes [-]
    fixed : dict
        Fixed heads, node index to head; at least one [m]
    start : list of int
        First node of each link (a positive flow leaves it) [-]
    end : list of int
        Second node of each link [-]
    head_loss : callable
        ``head_loss(Q) -> (h, dh/dQ)`` of every link at the flows Q, vectorised [m]
    demand : list of float
        Flow drawn off at each node (ignored at the fixed ones) [m^3/s]
    flow : list of float, optional
        Flows to start from (default: 1 L/s in every link) [m^3/s]
    tolerance : float
        Largest relative change of the flows at convergence [-]
    max_iterations : int
        Iterations allowed [-]

    Returns
    -------
    solution : NetworkSolution
        Flows, heads and the convergence record [-]

    References
    ----------
    1. Todini, E., and Pilati, S., 1988 (the gradient method).
    """
    from scipy.sparse import csr_matrix
    from scipy.sparse.linalg import spsolve

    start, end = np.asarray(start, dtype=int), np.asarray(end, dtype=int)
    links = len(start)
    if not fixed:
        raise NetworkError("a network needs at least one fixed head (a vessel)")
    unknown = np.array([i for i in range(nodes) if i not in fixed], dtype=int)
    column = np.full(nodes, -1)
    column[unknown] = np.arange(len(unknown))
    rows = np.arange(links)
    signed = np.concatenate([np.ones(links), -np.ones(links)])
    ends = np.concatenate([start, end])
    links_twice = np.concatenate([rows, rows])
    free = column[ends] >= 0
    A12 = csr_matrix(
        (signed[free], (links_twice[free], column[ends][free])), shape=(links, len(unknown))
    )
    H0 = np.zeros(nodes)
    for node, head in fixed.items():
        H0[node] = head
    # A10·H0: each link's fixed-head ends, signed.
    fixed_term = np.where(column[start] < 0, H0[start], 0.0) - np.where(
        column[end] < 0, H0[end], 0.0
    )
    _connected(nodes, start, end, fixed)
    q = np.asarray(demand, dtype=float)[unknown]
    Q = np.full(links, 1e-3) if flow is None else np.asarray(flow, dtype=float).copy()
    change = math.inf
    H = np.zeros(len(unknown))
    iterations = 0
    while change > tolerance:
        iterations += 1
        if iterations > max_iterations:
            raise NetworkError(
                f"no convergence in {max_iterations} iterations (last change {change:.2e})"
            )
        h, slope = head_loss(Q)
        slope = np.maximum(np.abs(slope), 1e-12)
        Dinv = 1.0 / slope
        M = (A12.T.multiply(Dinv)) @ A12
        rhs = -q - A12.T @ Q + A12.T @ (Dinv * (h - fixed_term))
        H = np.atleast_1d(spsolve(M.tocsc(), rhs)) if len(unknown) else H
        new = Q - Dinv * (h - A12 @ H - fixed_term)
        change = float(np.max(np.abs(new - Q)) / max(float(np.max(np.abs(new))), 1e-12))
        Q = new
    heads = H0.copy()
    heads[unknown] = H
    # Each junction's balance: what flows in less what flows out and the demand.
    balance = np.zeros(nodes)
    np.add.at(balance, end, Q)
    np.add.at(balance, start, -Q)
    residual = float(
        np.max(np.abs((balance - np.asarray(demand, dtype=float))[unknown]), initial=0.0)
    )
    return NetworkSolution(Q, heads, iterations, change, residual)


def _connected(nodes: int, start: np.ndarray, end: np.ndarray, fixed: dict[int, float]) -> None:
    """Refuse a network with a node that no path joins to a fixed head (its head would be
    undetermined and the head system singular)."""
    from scipy.sparse import coo_matrix
    from scipy.sparse.csgraph import connected_components

    graph = coo_matrix((np.ones(len(start)), (start, end)), shape=(nodes, nodes))
    _, label = connected_components(graph, directed=False)
    anchored = {label[node] for node in fixed}
    cut_off = [i for i in range(nodes) if label[i] not in anchored]
    if cut_off:
        raise NetworkError(
            f"node{'s' if len(cut_off) > 1 else ''} {', '.join(map(str, cut_off))} "
            "reach no fixed head (a vessel) through the links"
        )


def darcy_links(
    length: Any, diameter: Any, roughness: Any, minor_k: Any, density: float, viscosity: float
) -> Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]:
    r"""The head loss of pipes by Darcy–Weisbach with their minor losses, and its slope.

    .. math:: h = \left(f\frac{L}{D} + \Sigma K\right)\frac{Q|Q|}{2 g A^2},\qquad
        \frac{dh}{dQ} \approx \frac{2h}{Q}

    f from Colebrook–White (turbulent) or 64/Re (laminar), at the flow; the slope holds f
    constant (the Newton step stays a descent direction and converges; f is updated each
    iteration).

    Parameters
    ----------
    length : list of float
        Pipe lengths [m]
    diameter : list of float
        Inner diameters [m]
    roughness : list of float
        Absolute roughnesses [m]
    minor_k : list of float
        Sum of each pipe's fitting coefficients [-]
    density : float
        Liquid density [kg/m^3]
    viscosity : float
        Dynamic viscosity [Pa*s]

    Returns
    -------
    head_loss : callable
        ``head_loss(Q) -> (h, dh/dQ)`` for the pipes at flows Q [m]

    References
    ----------
    1. White, F. M., Fluid Mechanics, 7th ed., McGraw-Hill, 2011 (Darcy-Weisbach, Moody).
    2. Colebrook, C. F., J. Inst. Civil Engineers 11 (4), 1939.
    """
    from calcreport.physics import friction

    L = np.asarray(length, dtype=float)
    D = np.asarray(diameter, dtype=float)
    eD = np.asarray(roughness, dtype=float) / D
    K = np.asarray(minor_k, dtype=float)
    area = math.pi * D**2 / 4.0

    def head_loss(Q: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        q = np.maximum(np.abs(Q), _Q_FLOOR)
        Re = density * (q / area) * D / viscosity
        laminar = Re < friction.LAMINAR_LIMIT
        f = np.where(laminar, 64.0 / np.maximum(Re, 1e-12), 0.0)
        if np.any(~laminar):
            f[~laminar] = friction.colebrook(Re[~laminar], eD[~laminar])
        r = (f * L / D + K) / (2.0 * G * area**2)
        return r * Q * np.abs(Q), 2.0 * r * q

    return head_loss


# The loss of a closed link (a pump's or a check valve's reverse flow): a resistance so high
# that no head difference of a real network drives a measurable flow through it, which
# keeps the head system of the gradient method regular where a link is shut.
CLOSED_RESISTANCE = 1e8  # s/m^2, h = CLOSED_RESISTANCE·Q


def pump_link(
    flows: Any, heads: Any, speed_ratio: float = 1.0
) -> Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]:
    r"""A pump as a link: its head gain as a negative loss, from its curve moved by the
    affinity laws, one way only.

    .. math:: h(Q) = -s^2 H_0\!\left(\frac{Q}{s}\right) \quad (Q \ge 0),\qquad
        h(Q) = R_c\,Q - s^2 H_0(0) \quad (Q < 0)

    with s = n/n0 and H0 the curve through its points (monotone cubic); beyond the curve's
    last flow the gain falls on along its last slope, and a reverse flow meets a closed
    link (the pump's check valve).

    Parameters
    ----------
    flows : list of float
        Curve flows at the curve's speed, from zero [m^3/s]
    heads : list of float
        Curve heads at those flows [m]
    speed_ratio : float
        Operating speed over the curve's, n/n0 [-]

    Returns
    -------
    head_loss : callable
        ``head_loss(Q) -> (h, dh/dQ)`` of the pump link at flows Q (a gain is negative) [m]

    References
    ----------
    1. Karassik, I. J., et al., Pump Handbook, 4th ed., McGraw-Hill, 2008 (affinity laws).
    2. Todini, E., and Pilati, S., 1988 (pumps as links of the gradient method).
    """
    from calcreport.physics.pump.curve import monotone_cubic

    q0 = np.asarray(flows, dtype=float)
    h0 = np.asarray(heads, dtype=float)
    s = float(speed_ratio)
    top = q0[-1] * s
    dq = (q0[-1] - q0[-2]) * s * 1e-3
    end_head = s * s * h0[-1]
    end_slope = (end_head - s * s * float(monotone_cubic(q0, h0, (top - dq) / s))) / dq

    def head_loss(Q: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        Q = np.asarray(Q, dtype=float)
        inside = np.clip(Q, 0.0, top)
        gain = s * s * np.asarray(monotone_cubic(q0, h0, inside / s))
        step = np.maximum(dq, 1e-12)
        ahead = s * s * np.asarray(monotone_cubic(q0, h0, np.minimum(inside + step, top) / s))
        behind = s * s * np.asarray(monotone_cubic(q0, h0, np.maximum(inside - step, 0.0) / s))
        width = np.minimum(inside + step, top) - np.maximum(inside - step, 0.0)
        slope = (ahead - behind) / np.maximum(width, 1e-15)
        gain = np.where(Q > top, end_head + end_slope * (Q - top), gain)
        slope = np.where(Q > top, end_slope, slope)
        reverse = Q < 0.0
        h = np.where(reverse, CLOSED_RESISTANCE * Q - s * s * h0[0], -gain)
        dh = np.where(reverse, CLOSED_RESISTANCE, -slope)
        return h, dh

    return head_loss


def joined(
    parts: list[tuple[Any, Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]]], links: int
) -> Callable[[np.ndarray], tuple[np.ndarray, np.ndarray]]:
    """One ``head_loss`` for a network's links from the losses of its groups of links:
    ``parts`` pairs the indices of a group's links with the group's own ``head_loss``.

    Parameters
    ----------
    parts : list
        (link indices, head_loss of those links) pairs covering every link once [-]
    links : int
        Number of links in the network [-]

    Returns
    -------
    head_loss : callable
        ``head_loss(Q) -> (h, dh/dQ)`` of every link [m]
    """
    groups = [(np.asarray(index, dtype=int), loss) for index, loss in parts]

    def head_loss(Q: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        h, dh = np.zeros(links), np.zeros(links)
        for index, loss in groups:
            h[index], dh[index] = loss(Q[index])
        return h, dh

    return head_loss
