//! Prints the localized picture of each file given: localized orbitals with their centres
//! and populations, the Lewis structure and the ladder (a development aid).
//! Run: cargo run --release --no-default-features --example lewis_probe -- FILE...

use diptych::analysis::{Analysis, Settings};

fn main() {
    for path in std::env::args().skip(1) {
        let project = match diptych::project::open_path(std::path::Path::new(&path)) {
            Ok(opened) => opened.project,
            Err(error) => {
                eprintln!("{path}: {error}");
                continue;
            }
        };
        let analysis = match Analysis::run(&project.molecule, &Settings::default()) {
            Ok(a) => a,
            Err(error) => {
                eprintln!("{path}: {error}");
                continue;
            }
        };
        println!("== {path} ({} electrons)", analysis.electrons);
        let symbol = |a: usize| analysis.molecule.atoms[a].element.symbol();
        if let Some(picture) = &analysis.picture {
            for space in &picture.spaces {
                println!(
                    "   {:?}: {} orbitals, {} sweeps, converged {}",
                    space.space, space.orbitals, space.sweeps, space.converged
                );
            }
            for o in &picture.orbitals {
                let centres: Vec<String> = o
                    .centres
                    .iter()
                    .zip(&o.centre_populations)
                    .map(|(&a, q)| format!("{}{a}:{q:.3}", symbol(a)))
                    .collect();
                println!(
                    "   LO {:?} occ {:.3} e {:8.3} {:?} {:?} anti {} unit {:?} [{}]",
                    o.space,
                    o.occupancy,
                    o.energy_ev,
                    o.class,
                    o.character,
                    o.antibonding,
                    o.unit,
                    centres.join(" ")
                );
            }
            let l = &picture.lewis;
            for b in &l.bonds {
                println!(
                    "   bond {}{}–{}{} order {:.2} wiberg {:.3}",
                    symbol(b.atoms[0]),
                    b.atoms[0],
                    symbol(b.atoms[1]),
                    b.atoms[1],
                    b.order,
                    b.index
                );
            }
            println!(
                "   lone pairs {:?}",
                l.lone_pairs
                    .iter()
                    .map(|p| (p.atom, p.count))
                    .collect::<Vec<_>>()
            );
            println!(
                "   multicentre {:?}",
                l.multicentre
                    .iter()
                    .map(|m| (&m.atoms, m.electrons, m.kind))
                    .collect::<Vec<_>>()
            );
            println!(
                "   unpaired {:?}",
                l.unpaired
                    .iter()
                    .map(|m| (&m.atoms, m.electrons))
                    .collect::<Vec<_>>()
            );
            println!(
                "   formal charges {:?}",
                l.formal_charges
                    .iter()
                    .map(|q| format!("{q:.2}"))
                    .collect::<Vec<_>>()
            );
            println!("   lewis share {:.3}", l.lewis_share);
        }
        for h in &analysis.hybrid_entries {
            println!(
                "   hybrid {}{} {:?} → {:?} λ {:?} s% {:.1} share {:.3} bend {:?}",
                symbol(h.center),
                h.center,
                h.kind,
                h.partner,
                h.lambda.map(|x| (x * 100.0).round() / 100.0),
                h.s_percent,
                h.share,
                h.bending_degrees.map(|x| x.round())
            );
        }
        let total: f64 = analysis.localized.iter().map(|l| l.occupancy).sum();
        for l in &analysis.localized {
            println!(
                "   level {:<16} {:?} e {:8.3} occ {:.3} lewis {:.1}",
                l.label, l.kind, l.energy_ev, l.occupancy, l.lewis_occupancy
            );
        }
        println!("   Σ occupancy {total:.6}");
        for n in &analysis.notes {
            println!("   note [{:?}] {}", n.stage, n.message);
        }
        for e in &analysis.errors {
            println!("   ERROR [{:?}] {}", e.stage, e.message);
        }
    }
}
