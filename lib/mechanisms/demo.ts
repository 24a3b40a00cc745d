/**
 * A small invented mechanism for the demo: with the demo data (scripts/seed/seed-datasets.ts) it
 * gives every verdict at the default window 300–2500 K. Its numbers are invented, not taken from
 * any published mechanism.
 */
export const DEMO_MECHANISM = `! Invented demo mechanism for Arrhenia's mechanism check.
! Rate constants in cm3 molecule-1 s-1 (s-1 for first order); Ea written as Ea/R in kelvin.
ELEMENTS H C O N CL END
SPECIES OH CH4 H2O CH3 Cl HCl C2H6 H O2 HO2 O H2 END
REACTIONS MOLECULES KELVINS
OH+CH4=>H2O+CH3        2.30E-12   0.0   1760.0   ! near the demo data: agrees (used beyond them above 420 K)
Cl+CH4=>HCl+CH3        7.00E-11   0.0   1280.0   ! ten times the demo data: disagrees
C2H6=>CH3+CH3          2.00E+16   0.0  44000.0   ! agrees where measured (1000-2000 K), extrapolated below and above
O+H2=>OH+H             8.50E-20   2.67  3160.0   ! no published data: no data
H2O+CH3=>OH+CH4        3.20E-22   2.9   7480.0   ! data only for the reverse direction: no data, marked
H+O2(+M)<=>HO2(+M)     7.70E-11   0.0      0.0   ! falloff: not checked yet
     LOW / 5.0E-32 -1.2 0.0 /
     TROE / 0.6 1.0E-30 1.0E30 /
     H2O/10.0/
END
`;
