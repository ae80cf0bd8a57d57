//! Benchmark of the exact Yukawa values (run by `benches/couplings.sh`): for every model file given on the
//! command line (or every `catalogs-demo/*.toml`), every triple of multiplet bundles `L_a`, `L_a ⊗ L_b`,
//! `L_a^*`, `L_a^* ⊗ L_b^*`, `L_a ⊗ L_b^*` with non-zero `h^1` whose product is trivial, and extra codimension-2
//! configurations: per-tensor time and size, and the total per model (one core).
use sheafwright::cohomology::{CohomologyEngine, DEFAULT_SEED, PolynomialChoice};
use sheafwright::couplings::CouplingEngine;
use sheafwright::geometry::Configuration;
use sheafwright::io::model::{Model, PolynomialMode};
use std::time::Instant;

fn multiplet_bundles(l: &[Vec<i64>]) -> Vec<Vec<i64>> {
    let m = l[0].len();
    let mut out: Vec<Vec<i64>> = Vec::new();
    let mut push = |v: Vec<i64>| {
        if v.iter().any(|&x| x != 0) && !out.contains(&v) {
            out.push(v);
        }
    };
    for a in 0..l.len() {
        push(l[a].clone());
        push(l[a].iter().map(|x| -x).collect());
        for b in 0..l.len() {
            if a == b {
                continue;
            }
            push((0..m).map(|i| l[a][i] + l[b][i]).collect());
            push((0..m).map(|i| -l[a][i] - l[b][i]).collect());
            push((0..m).map(|i| l[a][i] - l[b][i]).collect());
        }
    }
    out
}

fn run(name: &str, engine: &CohomologyEngine, bundles: &[Vec<i64>]) {
    let ce = CouplingEngine::new(engine);
    let t_model = Instant::now();
    let mut with_h1 = Vec::new();
    for b in multiplet_bundles(bundles) {
        match engine.cohomology(&b) {
            Ok(c) if c.h[1] > 0 => with_h1.push(b),
            Ok(_) => {}
            Err(e) => println!("  {name}: {b:?}: {e}"),
        }
    }
    let mut count = 0;
    for i in 0..with_h1.len() {
        for j in i..with_h1.len() {
            for l in j..with_h1.len() {
                let (a, b, c) = (&with_h1[i], &with_h1[j], &with_h1[l]);
                if (0..a.len()).any(|r| a[r] + b[r] + c[r] != 0) {
                    continue;
                }
                let t0 = Instant::now();
                match ce.yukawa_tensor([a, b, c]) {
                    Ok(t) => {
                        let nz = t
                            .values
                            .iter()
                            .filter(|v| !num_traits::Zero::is_zero(*v))
                            .count();
                        println!(
                            "  {name}: {a:?} {b:?} {c:?}: dims {:?} types {:?} nonzero {nz}  {:.3} ms",
                            t.dims,
                            t.types,
                            t0.elapsed().as_secs_f64() * 1e3
                        );
                    }
                    Err(e) => println!("  {name}: {a:?} {b:?} {c:?}: refused: {e}"),
                }
                count += 1;
            }
        }
    }
    println!(
        "{name}: {count} tensors over {} bundles with h^1 > 0, total {:.3} s (cohomology + lifts + products)",
        with_h1.len(),
        t_model.elapsed().as_secs_f64()
    );
}

fn main() {
    let mut paths: Vec<String> = std::env::args().skip(1).collect();
    if paths.is_empty() {
        let mut v: Vec<String> = std::fs::read_dir("catalogs-demo")
            .expect("catalogs-demo")
            .filter_map(|e| e.ok().map(|e| e.path().display().to_string()))
            .filter(|p| p.ends_with(".toml"))
            .collect();
        v.sort();
        paths = v;
    }
    for p in &paths {
        let model = match Model::load(std::path::Path::new(p)) {
            Ok(m) => m,
            Err(e) => {
                println!("{p}: {e}");
                continue;
            }
        };
        let Some(bundles) = model.line_bundles() else {
            continue;
        };
        let choice = match (model.mode(), model.polynomials()) {
            (PolynomialMode::Given, Some(polys)) => PolynomialChoice::Given(polys.to_vec()),
            _ => PolynomialChoice::Generic {
                seed: model.seed().unwrap_or(DEFAULT_SEED),
            },
        };
        let engine = CohomologyEngine::new(model.config(), choice).expect("engine");
        run(&model.name, &engine, bundles);
    }
    // Codimension-2 configurations with invented rank-5 sums (c1 = 0; not necessarily anomaly-free).
    type Case = (&'static str, Vec<i64>, Vec<Vec<i64>>, Vec<Vec<i64>>);
    let extra: [Case; 2] = [
        (
            "P1^5[(1,1,1,1,2);(1,1,1,1,0)]",
            vec![1, 1, 1, 1, 1],
            vec![vec![1, 1, 1, 1, 2], vec![1, 1, 1, 1, 0]],
            vec![
                vec![1, -1, 0, 0, 0],
                vec![0, 1, -1, 0, 0],
                vec![0, 0, 1, -1, 0],
                vec![-1, 0, 0, 1, 1],
                vec![0, 0, 0, 0, -1],
            ],
        ),
        (
            "P1xP4[(0,2);(2,3)]",
            vec![1, 4],
            vec![vec![0, 2], vec![2, 3]],
            vec![
                vec![2, -1],
                vec![-1, 1],
                vec![-1, 0],
                vec![1, 0],
                vec![-1, 0],
            ],
        ),
    ];
    for (name, dims, eqs, bundles) in extra {
        let config = Configuration::new(&dims, &eqs).expect("configuration");
        let engine =
            CohomologyEngine::new(&config, PolynomialChoice::Generic { seed: DEFAULT_SEED })
                .unwrap();
        run(name, &engine, &bundles);
    }
    // A codimension-2 triple whose classes all have type 1 (large rational coefficients in the lifts).
    let config = Configuration::new(
        &[1, 1, 1, 1, 1],
        &[vec![1, 1, 1, 1, 2], vec![1, 1, 1, 1, 0]],
    )
    .expect("configuration");
    let engine = CohomologyEngine::new(&config, PolynomialChoice::Generic { seed: 3 }).unwrap();
    let ce = CouplingEngine::new(&engine);
    let t: [&[i64]; 3] = [&[-1, 1, 1, -1, 0], &[3, 1, -2, -2, 0], &[-2, -2, 1, 3, 0]];
    let t0 = Instant::now();
    match ce.yukawa_tensor(t) {
        Ok(r) => println!(
            "P1^5 type-1 triple {:?}: dims {:?} types {:?}  {:.3} s",
            t,
            r.dims,
            r.types,
            t0.elapsed().as_secs_f64()
        ),
        Err(e) => println!("P1^5 type-1 triple: refused: {e}"),
    }
}
