-- m2_one.m2: compute h^q(X, O_X(k)) for one case with Macaulay2.
-- usage: M2 --script m2_one.m2 AMBIENT EQUATIONS POLYNOMIALS BUNDLE [METHOD]
--   AMBIENT      e.g. 1,1,1,1        EQUATIONS  e.g. 2,1;1,3
--   POLYNOMIALS  generic | f1;f2;... (xI_J syntax, integer coefficients)
--   BUNDLE       e.g. -1,2,0,1       METHOD     auto | proj | les   (default auto)
-- Generic equations: random over ZZ/32003 after setRandomSeed 42 (same in every run).
-- prints one line:  h=h0,h1,h2,h3<TAB>seconds=...<TAB>method=...
here = currentFileDirectory;
load(here | "lb_cohomology.m2");
load(here | "lb_hypersurface.m2");
args = drop(scriptCommandLine, 1);
-- drop everything up to and including the script name
pos = position(args, a -> match("m2_one\\.m2$", a));
if pos =!= null then args = drop(args, pos + 1);
parseInts = s -> apply(separate(",", s), a -> value a);
n = parseInts args#0;
qs = apply(separate(";", args#1), parseInts);
polys = if args#2 == "generic" then "generic" else separate(";", args#2);
k = parseInts args#3;
meth = if #args > 4 then args#4 else "auto";
if meth == "auto" then meth = (if #n == 1 or #qs > 1 then "proj" else "les");
setRandomSeed 42;
S = coxRing n;
eqs = makeEquations(S, qs, polys);
r = elapsedTiming (if meth == "les" then lbHypersurface(n, qs#0, eqs#0, k) else lbCohomology(n, qs, eqs, k));
print("h=" | demark(",", apply(r#1, toString)) | "\tseconds=" | format(0, 3, 3, 3, "", r#0) | "\tmethod=" | meth);
