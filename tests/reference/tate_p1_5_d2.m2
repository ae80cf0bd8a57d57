-- tate_p1_5_d2.m2: h^q(X, O_X(0,2,2,2,2)) for X in P1^5 cut out by the two explicit polynomials below
-- (multidegrees (1,1,1,1,2) and (1,1,1,1,0), the same polynomials as in m2_tate.tsv), computed with the
-- Macaulay2 package TateOnProducts (Tate resolutions on products of projective spaces) over ZZ/32003.
-- usage: M2 --script tate_p1_5_d2.m2     (about 850 s on a 2-core machine, 2026-12-02)
-- prints the elapsed seconds, then lines (q, h^q).
needsPackage "TateOnProducts";
(S,E) = productOfProjectiveSpaces({1,1,1,1,1}, Variables => {getSymbol "y", getSymbol "e"});
-- map xI_J to the package's variables
R0 = ZZ/32003[x1_0,x1_1,x2_0,x2_1,x3_0,x3_1,x4_0,x4_1,x5_0,x5_1];
f1 =  - 4*x1_1*x2_1*x3_1*x4_1*x5_1^2 + x1_1*x2_1*x3_1*x4_1*x5_0*x5_1 - 9*x1_1*x2_1*x3_1*x4_1*x5_0^2 - 5*x1_1*x2_1*x3_1*x4_0*x5_1^2 + 7*x1_1*x2_1*x3_1*x4_0*x5_0*x5_1 - 2*x1_1*x2_1*x3_1*x4_0*x5_0^2 + 8*x1_1*x2_1*x3_0*x4_1*x5_1^2 - 2*x1_1*x2_1*x3_0*x4_1*x5_0*x5_1 - 9*x1_1*x2_1*x3_0*x4_1*x5_0^2 + x1_1*x2_1*x3_0*x4_0*x5_1^2 + 6*x1_1*x2_1*x3_0*x4_0*x5_0*x5_1 + 8*x1_1*x2_1*x3_0*x4_0*x5_0^2 - 8*x1_1*x2_0*x3_1*x4_1*x5_1^2 + x1_1*x2_0*x3_1*x4_1*x5_0*x5_1 - 5*x1_1*x2_0*x3_1*x4_1*x5_0^2 - 5*x1_1*x2_0*x3_1*x4_0*x5_1^2 - 7*x1_1*x2_0*x3_1*x4_0*x5_0*x5_1 + 8*x1_1*x2_0*x3_1*x4_0*x5_0^2 - 7*x1_1*x2_0*x3_0*x4_1*x5_1^2 + x1_1*x2_0*x3_0*x4_1*x5_0*x5_1 + x1_1*x2_0*x3_0*x4_1*x5_0^2 + 2*x1_1*x2_0*x3_0*x4_0*x5_1^2 + 6*x1_1*x2_0*x3_0*x4_0*x5_0*x5_1 + 4*x1_1*x2_0*x3_0*x4_0*x5_0^2 - 2*x1_0*x2_1*x3_1*x4_1*x5_1^2 + 5*x1_0*x2_1*x3_1*x4_1*x5_0*x5_1 + 8*x1_0*x2_1*x3_1*x4_1*x5_0^2 + x1_0*x2_1*x3_1*x4_0*x5_1^2 + 4*x1_0*x2_1*x3_1*x4_0*x5_0*x5_1 - 6*x1_0*x2_1*x3_1*x4_0*x5_0^2 + 3*x1_0*x2_1*x3_0*x4_1*x5_1^2 + 8*x1_0*x2_1*x3_0*x4_1*x5_0*x5_1 + 9*x1_0*x2_1*x3_0*x4_1*x5_0^2 - 5*x1_0*x2_1*x3_0*x4_0*x5_1^2 + 3*x1_0*x2_1*x3_0*x4_0*x5_0*x5_1 + 6*x1_0*x2_1*x3_0*x4_0*x5_0^2 - 4*x1_0*x2_0*x3_1*x4_1*x5_1^2 + 2*x1_0*x2_0*x3_1*x4_1*x5_0*x5_1 - 3*x1_0*x2_0*x3_1*x4_1*x5_0^2 - x1_0*x2_0*x3_1*x4_0*x5_1^2 + 6*x1_0*x2_0*x3_1*x4_0*x5_0*x5_1 + 6*x1_0*x2_0*x3_1*x4_0*x5_0^2 - 3*x1_0*x2_0*x3_0*x4_1*x5_1^2 + 4*x1_0*x2_0*x3_0*x4_1*x5_0*x5_1 + x1_0*x2_0*x3_0*x4_1*x5_0^2 - 2*x1_0*x2_0*x3_0*x4_0*x5_1^2 - 7*x1_0*x2_0*x3_0*x4_0*x5_0*x5_1 - 6*x1_0*x2_0*x3_0*x4_0*x5_0^2;
f2 =  - x1_1*x2_1*x3_1*x4_1 - x1_1*x2_1*x3_1*x4_0 + 4*x1_1*x2_1*x3_0*x4_1 + 2*x1_1*x2_1*x3_0*x4_0 + 3*x1_1*x2_0*x3_1*x4_1 + 5*x1_1*x2_0*x3_1*x4_0 - x1_1*x2_0*x3_0*x4_1 - x1_1*x2_0*x3_0*x4_0 + 5*x1_0*x2_1*x3_1*x4_1 - 5*x1_0*x2_1*x3_1*x4_0 - x1_0*x2_1*x3_0*x4_1 + 5*x1_0*x2_1*x3_0*x4_0 - 9*x1_0*x2_0*x3_1*x4_1 + 3*x1_0*x2_0*x3_1*x4_0 - 3*x1_0*x2_0*x3_0*x4_1 + 5*x1_0*x2_0*x3_0*x4_0;
phi = map(S, R0, gens S);
J = ideal(phi f1, phi f2);
print toString apply(J_*, degree);
M = S^1/J;
t = elapsedTiming cohomologyHashTable(M, {0,2,2,2,2}, {0,2,2,2,2});
print t#0;
H = t#1;
scan(4, i -> print(i, H#({{0,2,2,2,2}, i})));
