"""A network's response as poles and residues, every trial at once: evaluating it at any
frequency then costs a sum over the poles instead of a matrix solve.

With the MNA matrices A(s) = A0 + s·A1 (s = jω, engine/network.py) and a response that is
a fixed linear combination c of the unknowns plus a constant d, the unknowns that A1 does
not touch (resistor-only nodes, turns-ratio and source currents) are eliminated first
(Schur complement, exact); on the rest, with E the remaining block of A1,

    H(s) = c_r·(A_r + sE)⁻¹·b_r + d_r = c_r·V (Λ + sI)⁻¹ V⁻¹ E⁻¹ b_r + d_r
         = Σ_k r_k/(s + λ_k) + d_r,

where M = E⁻¹A_r = VΛV⁻¹ (the partial-fraction form of a rational transfer function,
e.g. Kailath, Linear Systems, 1980, §2.1 (from memory)). One batched eigen-decomposition
per trial replaces the solves of a Newton search; `pole_residue` returns None where the
form does not exist or does not reproduce the exact solve (a singular block, an
ill-conditioned eigenbasis), and the caller solves directly.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from sheetgen.engine.network import Network, solve, stamps

# The form must reproduce the exact solve this closely at its check frequency, else unused.
AGREEMENT = 1e-9


@dataclass(frozen=True)
class PoleResidue:
    """H(s) = Σ residues/(s + poles) + direct, per trial (arrays of shape trials + (m,))."""

    poles: np.ndarray
    residues: np.ndarray
    direct: np.ndarray

    def take(self, index: np.ndarray) -> PoleResidue:
        """The trials at the flat `index`."""
        m = self.poles.shape[-1]
        return PoleResidue(self.poles.reshape(-1, m)[index], self.residues.reshape(-1, m)[index],
                           self.direct.reshape(-1)[index])

    def at(self, f_hz, order: int = 0):
        """H(jω) and its first `order` ω-derivatives: H' = −j·Σ r/(s+λ)², H'' = −2·Σ r/(s+λ)³.

        f_hz has the trials' shape, or that shape plus one trailing axis (a grid per trial)."""
        f = np.asarray(f_hz, dtype=float)
        extra = f.ndim - self.direct.ndim
        poles, residues, direct = self.poles, self.residues, self.direct
        for _ in range(extra):
            poles, residues, direct = poles[..., None, :], residues[..., None, :], direct[..., None]
        inverse = 1.0 / (2j * np.pi * f[..., None] + poles)
        term = residues * inverse
        h = term.sum(axis=-1) + direct
        h1 = h2 = None
        if order >= 1:
            term = term * inverse
            h1 = -1j * term.sum(axis=-1)
        if order >= 2:
            h2 = -2.0 * (term * inverse).sum(axis=-1)
        return h, h1, h2


def pole_residue(network: Network, c: np.ndarray, d: float, check_hz: float) -> PoleResidue | None:
    """The partial-fraction form of c·x + d for every trial of the network (module notes),
    or None where it does not exist or misses the exact solve at check_hz by more than
    AGREEMENT."""
    st = stamps(network)
    a0, a1, b = st.a0, st.a1, st.b
    n = b.shape[-1]
    touched = np.any(a1 != 0.0, axis=tuple(range(a1.ndim - 2))) if a1.ndim > 2 else a1 != 0.0
    dynamic = np.flatnonzero(touched.any(axis=0) | touched.any(axis=1))
    algebraic = np.setdiff1d(np.arange(n), dynamic)
    if dynamic.size == 0:
        return None
    c = np.asarray(c, dtype=float)
    take = np.ix_
    try:
        a_dd = a0[(..., *take(dynamic, dynamic))]
        e = a1[(..., *take(dynamic, dynamic))]
        b_r = b[..., dynamic]
        c_r = np.broadcast_to(c[dynamic], b_r.shape).astype(float)
        d_r = np.full(b.shape[:-1], float(d))
        if algebraic.size:
            a_aa = a0[(..., *take(algebraic, algebraic))]
            a_ad = a0[(..., *take(algebraic, dynamic))]
            a_da = a0[(..., *take(dynamic, algebraic))]
            k_ad = np.linalg.solve(a_aa, a_ad)
            k_b = np.linalg.solve(a_aa, b[..., algebraic][..., None])[..., 0]
            a_dd = a_dd - a_da @ k_ad
            b_r = b_r - (a_da @ k_b[..., None])[..., 0]
            c_a = c[algebraic]
            c_r = c_r - c_a @ k_ad
            d_r = d_r + (k_b @ c_a)
        with np.errstate(all="ignore"):
            m = np.linalg.solve(e, a_dd)
            g = np.linalg.solve(e, b_r[..., None])[..., 0]
            poles, vectors = np.linalg.eig(m)
            right = np.linalg.solve(vectors, g[..., None].astype(complex))[..., 0]
        left = (c_r[..., None, :] @ vectors)[..., 0, :]
    except np.linalg.LinAlgError:
        return None
    form = PoleResidue(poles, left * right, d_r.astype(complex))
    exact = solve(network, check_hz).x @ c + d
    approx = form.at(np.full(b.shape[:-1], check_hz))[0]
    scale = np.maximum(np.abs(exact), 1e-300)
    if not np.all(np.isfinite(approx)) or np.max(np.abs(approx - exact) / scale) > AGREEMENT:
        return None
    return form
