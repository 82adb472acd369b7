"""Entropy benchmarks: the adsorbate models against two published measures of adsorbate entropy.

Two comparisons, every number computed here from the models (nothing stored
but inputs):

(a) **Campbell–Sellers correlation.** C. T. Campbell, J. R. V. Sellers, "The
    Entropies of Adsorbed Molecules", J. Am. Chem. Soc. 2012, 134, 18109–18115:
    S°_ad(T) = 0.70 S°_gas(T) − 3.3 R, standard deviation 2R, for molecular
    adsorbates at high coverage. Eight small gas molecules (Ar, N2, CO, CO2,
    H2O, NH3, CH4, C2H6) with *real* gas-phase data (rotational constants,
    fundamentals, symmetry numbers from the project's reference compilation,
    each row naming the original source) sit on **invented** sites whose
    spacing, barriers, orientation and extra frustrated-mode frequencies are
    made up and labelled so (:data:`INVENTED_SITES`). Each adsorbate is
    evaluated with :func:`adsorb.model_choice.compare_models` (harmonic,
    hindered, 2D gas) plus a 2D gas with a free rotor about the normal, at a
    named standard state (default θ° = 1/2; the adsorbate standard state of
    the 2012 data set is not verified in the project's notes).

(b) **n-alkanes on MgO(100).** S. L. Tait, Z. Dohnálek, C. T. Campbell,
    B. D. Kay, J. Chem. Phys. 2005, 122, 164708 (and, for n-butane, the same
    authors, J. Chem. Phys. 2005, DOI 10.1063/1.1883629): first-order
    desorption prefactors rising from about 10^13.1 s^-1 (CH4) to 10^19.1 s^-1
    (n-decane), E_d(N) = 6.5 + 7.1 N kJ/mol, heating rate 0.6 K/s; n-butane
    10^(15.7 ± 1.6) s^-1 (:data:`TAIT_2005`). The transition-state-theory
    prefactor ν(T) = (kT/h) q‡/q_ad (reference notes §5.2; C. T. Campbell,
    L. H. Sprowl, L. Árnadóttir, J. Phys. Chem. C 2016, 120, 10283) is computed
    with a **2D-gas transition state that keeps the gas molecule's free 3D
    rotation**, moving over the area of one site b², for adsorbates treated as
    harmonic (localized), hindered (Sprowl, Campbell, Árnadóttir, J. Phys.
    Chem. C 2016, 120, 9719), 2D gas, 2D gas with a free rotor about the normal,
    and a gas-like 2D gas with free 3D rotation (the limit ν → ν_z of §5.2).

Simplifications of (b), stated once here and in docs/entropy-benchmarks.md:

* the molecule's internal vibrations are taken as unchanged on adsorption, so
  they cancel in q‡/q_ad and only the external modes (two in-plane
  translations, three rotations, the stretch against the surface) matter; no
  gas-phase vibrations of the long alkanes are needed (none are sourced);
* every molecule is rigid and all-trans: conformational entropy is not
  modelled (:func:`conformer_ln_q` gives an independent-bond estimate of what
  it could add, for the discussion only);
* the TS moves over one site area b² with b the cation–cation distance of
  MgO(100); a TS spread over the molecule's whole footprint would raise
  log10 ν by log10(footprint/b²);
* a constant-prefactor analysis of a TPD peak produced by
  k(T) = ν(T) exp(−E0/kT) returns the *Arrhenius* pair E_a = E0 + γ kT and
  A = ν(T) e^γ, γ = d ln ν/d ln T; A is what is compared with the published
  prefactors, at the peak temperature where A(Tp) and the published E_d put
  the peak (Redhead's first-order peak condition, :mod:`adsorb.tpd`).

Geometry: ``ase.build.molecule`` (the G2 set) for CH4, C2H6, C3H8 and
trans-butane; a zig-zag all-trans chain built here (:func:`zigzag_alkane`)
for hexane, octane and decane. The functions that build structures
(:func:`benchmark_gas`, :func:`zigzag_alkane`, :func:`alkane_atoms`) do so
through :mod:`adsorb.io` (ASE is imported only there and in
:mod:`adsorb.geometry`).

The package holds one subject per module, and every public name is imported
from here: the inputs in :mod:`~adsorb.entropy_benchmarks.data`, benchmark
(a) in :mod:`~adsorb.entropy_benchmarks.correlation`, the alkanes and their
sites in :mod:`~adsorb.entropy_benchmarks.alkane_sites`, the prefactors of
benchmark (b) in :mod:`~adsorb.entropy_benchmarks.alkane_prefactors`, and the
Markdown tables and figures in :mod:`~adsorb.entropy_benchmarks.tables` and
:mod:`~adsorb.entropy_benchmarks.plots`.
"""

from adsorb.entropy_benchmarks.alkane_prefactors import (
    ALKANE_MODELS,
    AlkaneRow,
    SENSITIVITY_KEYS,
    adsorbate_contribution,
    alkane_benchmark,
    alkane_sensitivity,
    arrhenius_peak,
    conformer_ln_q,
    desorption_prefactor,
    published_peak_temperature,
    transition_state,
)
from adsorb.entropy_benchmarks.alkane_sites import AlkaneSite, alkane_atoms, alkane_site, zigzag_alkane
from adsorb.entropy_benchmarks.correlation import (
    CORRELATION_MODELS,
    CorrelationRow,
    benchmark_adsorbate,
    benchmark_gas,
    correlation_benchmark,
    standard_state_sensitivity,
)
from adsorb.entropy_benchmarks.data import (
    ALKANE_CHAIN_LENGTHS,
    ALKANE_SURFACE,
    GAS_DATA,
    GasData,
    INVENTED_SITES,
    InventedSite,
    TAIT_2005,
)
from adsorb.entropy_benchmarks.plots import plot_alkane_prefactors, plot_correlation_benchmark
from adsorb.entropy_benchmarks.tables import (
    markdown_alkane_site_table,
    markdown_alkane_table,
    markdown_correlation_table,
    markdown_peak_table,
    markdown_sensitivity_table,
    markdown_site_table,
    markdown_standard_state_table,
)

__all__ = [
    "GasData",
    "InventedSite",
    "GAS_DATA",
    "INVENTED_SITES",
    "CORRELATION_MODELS",
    "CorrelationRow",
    "benchmark_gas",
    "benchmark_adsorbate",
    "correlation_benchmark",
    "standard_state_sensitivity",
    "TAIT_2005",
    "ALKANE_SURFACE",
    "ALKANE_CHAIN_LENGTHS",
    "ALKANE_MODELS",
    "AlkaneSite",
    "AlkaneRow",
    "zigzag_alkane",
    "alkane_atoms",
    "alkane_site",
    "adsorbate_contribution",
    "transition_state",
    "desorption_prefactor",
    "arrhenius_peak",
    "published_peak_temperature",
    "alkane_benchmark",
    "alkane_sensitivity",
    "SENSITIVITY_KEYS",
    "conformer_ln_q",
    "markdown_site_table",
    "markdown_correlation_table",
    "markdown_standard_state_table",
    "markdown_alkane_site_table",
    "markdown_alkane_table",
    "markdown_peak_table",
    "markdown_sensitivity_table",
    "plot_correlation_benchmark",
    "plot_alkane_prefactors",
]
