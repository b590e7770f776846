//! Benchmarks: immunize. Rule orders (CoreHD, Collective Influence,
//! adaptive degree) on an Erdős–Rényi network of 10⁵ people and mean
//! degree 3.5, beside one bare reverse-add sweep on the same network as the
//! same-run baseline. The real-size ranking run is
//! `examples/immunize_bench.rs`; see benches/README.md for logged runs.

use criterion::{criterion_group, criterion_main, Criterion};
use spreadplan::immunize::{removal_order, Rule, RuleParams};
use spreadplan::network::generate;
use spreadplan::percolation::{
    budget_curve_into, BudgetCurve, BudgetCurveConfig, Scratch, Transmissibility,
};
use spreadplan::rng::{self, Stage};

fn orders(c: &mut Criterion) {
    let net = generate::gnm(100_000, 175_000, 1).unwrap();
    let mut g = c.benchmark_group("immunize_orders_er_1e5");
    let cfg = BudgetCurveConfig::new(Transmissibility::Uniform(0.5), 1.0, 7);
    let order: Vec<u32> = (0..net.node_count() as u32).collect();
    let mut scratch = Scratch::new(net.node_count());
    let mut curve = BudgetCurve::default();
    g.bench_function("bare_reverse_add_sweep", |b| {
        b.iter(|| budget_curve_into(&net, &cfg, 0, None, &order, &mut scratch, &mut curve).unwrap())
    });
    for rule in [Rule::CoreHd, Rule::CollectiveInfluence, Rule::DegreeAdaptive] {
        g.bench_function(rule.name(), |b| {
            b.iter(|| {
                let mut rng = rng::stream(1, Stage::Rule, 0);
                removal_order(&net, rule, &RuleParams::default(), &[], &mut rng)
            })
        });
    }
    g.finish();
}

criterion_group!(benches, orders);
criterion_main!(benches);
