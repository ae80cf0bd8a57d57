-- lb_hypersurface.m2
-- Second, elementary method for HYPERSURFACES X = {f = 0} in A = P^{n_1} x ... x P^{n_m}
-- (used where the Segre/Proj method of lb_cohomology.m2 is too slow, e.g. A = (P^1)^4).
-- Long exact sequence of 0 -> O_A(k-q) -f-> O_A(k) -> O_X(k) -> 0:
--   h^j(X,k) = dim H^j(A,k) - rank f_j + dim H^{j+1}(A,k-q) - rank f_{j+1},
-- where f_j : H^j(A,k-q) -> H^j(A,k).  Cohomology of O_A(d) is represented by Cech
-- classes of Laurent monomials (Kuenneth): on a factor with d_i >= 0 ordinary monomials,
-- on a factor with d_i <= -n_i-1 monomials with all exponents <= -1; multiplication by f
-- kills terms leaving that set.  Ranks are computed with Macaulay2 linear algebra.

-- exponent vectors of length L with entries >= lo summing to tot
lbCompositions = (L, tot, lo) -> (
    if L == 1 then (if tot >= lo then {{tot}} else {})
    else flatten apply(toList(lo .. tot - lo * (L - 1)), a -> apply(lbCompositions(L - 1, tot - a, lo), r -> prepend(a, r))));

-- basis of H^*(A, O(d)) as list of exponent vectors, and cohomological degree (or null if zero)
lbLineBasis = (n, d) -> (
    parts := apply(#n, i -> (
        if d#i >= 0 then (0, lbCompositions(n#i + 1, d#i, 0))
        else if d#i <= - n#i - 1 then (n#i, apply(lbCompositions(n#i + 1, - d#i, 1), v -> - v))
        else (0, {})));
    j := sum apply(parts, p -> p#0);
    B := fold((a, b) -> flatten apply(a, u -> apply(b, v -> u | v)), {{}}, apply(parts, p -> p#1));
    (j, B));

lbOK = (n, ex, negmask) -> all(#n, i -> (
    off := sum apply(i, l -> n#l + 1);
    if negmask#i then all(n#i + 1, c -> ex#(off + c) <= -1) else all(n#i + 1, c -> ex#(off + c) >= 0)));

-- rank of f : H^j(A, d) -> H^j(A, d + q)
lbRank = (n, f, d, q, j) -> (
    (js, Bs) := lbLineBasis(n, d);
    (jt, Bt) := lbLineBasis(n, d + q);
    if #Bs == 0 or #Bt == 0 or js != j or jt != j then return 0;
    negmask := apply(#n, i -> (d + q)#i < 0);
    tpos := new HashTable from apply(#Bt, a -> Bt#a => a);
    fterms := apply(terms f, t -> (leadCoefficient t, first exponents leadMonomial t));
    H := new MutableHashTable;
    scan(#Bs, c -> scan(fterms, ct -> (
        ex := Bs#c + ct#1;
        if tpos#?ex and lbOK(n, ex, negmask) then (
            key := (tpos#ex, c);
            H#key = (if H#?key then H#key else 0) + ct#0))));
    M := map((coefficientRing ring f)^(#Bt), (coefficientRing ring f)^(#Bs), apply(pairs H, p -> p#0 => p#1));
    rank M);

lbDimH = (n, d, j) -> ((jj, B) := lbLineBasis(n, d); if jj == j then #B else 0);

lbHypersurface = (n, q, f, k) -> (
    dimX := sum n - 1;
    apply(dimX + 1, j ->
        lbDimH(n, k, j) - lbRank(n, f, k - q, q, j)
        + lbDimH(n, k - q, j + 1) - lbRank(n, f, k - q, q, j + 1)));
