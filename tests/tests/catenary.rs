//! The elastic catenary member against the closed form, against chains of links, and against
//! the equivalent modulus of a sagging stay.
//!
//! Reference: Irvine, *Cable Structures* (MIT Press 1981), ch. 1, the elastic catenary (from
//! memory, shared REFERENCES §2). With the tension at end a having horizontal component `H`
//! and vertical component `V` (up, along the cable towards b), weight `w` per unstressed
//! length and unstressed length `L0`, the point at unstressed arc length `s` is
//!   `x(s) = H s/EA + (H/w)[asinh((V + w s)/H) − asinh(V/H)]`,
//!   `z(s) = (V s + w s²/2)/EA + (H/w)[√(1 + ((V + w s)/H)²) − √(1 + (V/H)²)]`,
//! and end b carries `(H, V + w L0)`. The check below needs only this forward map: the test
//! picks `H` and `V`, puts end b's load to match, and the solver must put end b at
//! `(x(L0), z(L0))`.

use rigwright_core::Vec3;
use rigwright_core::element::MemberKind;
use rigwright_core::element::response::respond;
use rigwright_core::gallery::hanging_chain;
use rigwright_core::model::{CaseDoc, LoadDoc, MemberDoc, MemberDocKind, NodeDoc, Rest};
use rigwright_core::{Project, Statics};
use rigwright_verification::{model, rel, solve};

/// Irvine's forward map: where end b is, relative to end a, in (horizontal, up) (m).
fn irvine_end(h: f64, v: f64, w: f64, ea: f64, l0: f64) -> (f64, f64) {
    let vb = v + w * l0;
    let x = h * l0 / ea + h / w * ((vb / h).asinh() - (v / h).asinh());
    let z = (v * l0 + 0.5 * w * l0 * l0) / ea + h / w * ((1.0 + (vb / h).powi(2)).sqrt() - (1.0 + (v / h).powi(2)).sqrt());
    (x, z)
}

/// One cable from an anchor at the origin to a free node loaded so that the tension at the
/// anchor is (H, V); drawn straight along the load's direction at its unstressed length.
fn loaded_cable(h: f64, v: f64, w: f64, ea: f64, l0: f64, g: f64) -> Project {
    let mut p = Project::new("one sagging cable");
    p.gravity = (0.0, -g, 0.0);
    let load = (h, v + w * l0);
    let dir = (load.0 / load.0.hypot(load.1), load.1 / load.0.hypot(load.1));
    p.nodes.push(NodeDoc {
        id: "a".into(),
        at: (0.0, 0.0, 0.0),
        mass: 0.0,
        fixed: [true; 3],
    });
    p.nodes.push(NodeDoc {
        id: "b".into(),
        at: (dir.0 * l0, dir.1 * l0, 0.0),
        mass: 0.0,
        fixed: [false, false, true],
    });
    p.members.push(MemberDoc {
        id: "c".into(),
        ends: ("a".into(), "b".into()),
        kind: MemberDocKind::Cable {
            ea,
            rest: Rest::Length(l0),
        },
        mass_per_length: w / g,
        design: None,
    });
    p.cases = vec![CaseDoc {
        name: "pull".into(),
        gravity: 1.0,
        loads: vec![LoadDoc {
            node: "b".into(),
            force: (load.0, load.1, 0.0),
        }],
    }];
    p
}

/// The solver puts the free end of a sagging cable where Irvine's closed form does, to 1e-9 of
/// the cable's length, and the anchor's reaction is (−H, −V) to 1e-9 of the tension: nearly
/// taut, level, inclined with the lower end above the lowest point, deep sag (span far
/// shorter than the cable), and nearly vertical.
#[test]
fn free_end_of_a_sagging_cable_lies_where_irvines_elastic_catenary_puts_it() {
    let g = 9.81;
    // (H, V, w, EA, L0): N, N, N/m, N, m.
    let cases = [
        (1e6, -500.0, 10.0, 1e7, 100.0),       // nearly taut: sag ≈ wL²/(8H) = 1.25 mm
        (2023.1664, -505.0, 10.0, 1e7, 101.0), // level, the REFERENCES check value
        (800.0, -200.0, 10.0, 1e6, 60.0),      // inclined, lowest point inside the span
        (300.0, 150.0, 10.0, 1e6, 60.0),       // lower end above the lowest point
        (50.0, -500.0, 10.0, 1e7, 100.0),      // deep sag: span a fraction of the length
        (1.0, 100.0, 10.0, 1e6, 10.0),         // nearly vertical, rising
        (1.0, -60.0, 10.0, 1e6, 10.0),         // nearly vertical, the lowest point inside
    ];
    for (h, v, w, ea, l0) in cases {
        let m = model(&loaded_cable(h, v, w, ea, l0, g));
        let eq = solve(&m);
        assert!(eq.stability.is_stable(), "H {h} V {v}: {:?}", eq.stability);
        let (x, z) = irvine_end(h, v, w, ea, l0);
        let at = eq.nodes[1].position;
        assert!(
            (at.x - x).abs() <= 1e-9 * l0 && (at.y - z).abs() <= 1e-9 * l0,
            "H {h} V {v}: end at ({}, {}) vs Irvine ({x}, {z})",
            at.x,
            at.y
        );
        let t = h.hypot(v);
        let r = eq.nodes[0].reaction.unwrap();
        assert!(
            (r.x + h).abs() <= 1e-9 * t && (r.y + v).abs() <= 1e-9 * t,
            "H {h} V {v}: reaction {r:?}"
        );
        // The member's reported force is its largest tension, at one of its ends.
        let tb = h.hypot(v + w * l0);
        assert!(
            rel(eq.members[0].force, t.max(tb)) < 1e-9,
            "force {} vs {}",
            eq.members[0].force,
            t.max(tb)
        );
        let sag = eq.members[0].sag.as_ref().expect("a cable with weight reports its sag");
        assert!(rel(sag.horizontal, h) < 1e-9, "H {} vs {h}", sag.horizontal);
        assert!(rel(sag.weight, w * l0) < 1e-12);
    }
}

/// A chain of straight weightless links with the cable's weight lumped at the nodes converges
/// to the elastic catenary member with error ∝ 1/N² (Richardson extrapolation lands on it to
/// 1e-6), and a chain of catenary links gives the one-member answer whatever the number of
/// links (the exact member has no discretisation error).
#[test]
fn chains_of_links_converge_to_the_catenary_member() {
    let (span, length, ea, w, g) = (100.0, 101.0, 1e7, 10.0, 9.81);
    let horizontal = |p: &Project| {
        let eq = solve(&model(p));
        assert!(eq.stability.is_stable(), "{:?}", eq.stability);
        eq.nodes[0].reaction.unwrap().x.abs()
    };
    let exact = horizontal(&hanging_chain(1, span, length, ea, w, g, 0.0));
    // The REFERENCES check value, computed from Irvine's equations (8 figures given).
    assert!(rel(exact, 2023.1664) < 1e-7, "one member: H = {exact}");
    for links in [2, 5, 40] {
        let h = horizontal(&hanging_chain(links, span, length, ea, w, g, 6.0));
        assert!(rel(h, exact) < 1e-9, "{links} catenary links: H = {h} vs {exact}");
    }
    let lumped = |links: usize| {
        let mut p = hanging_chain(links, span, length, ea, w, g, 6.0);
        let link_mass = w / g * length / links as f64;
        for m in &mut p.members {
            m.mass_per_length = 0.0;
        }
        for (k, n) in p.nodes.iter_mut().enumerate() {
            n.mass = if k == 0 || k == links { 0.5 } else { 1.0 } * link_mass;
        }
        horizontal(&p)
    };
    let (h10, h20, h40) = (lumped(10), lumped(20), lumped(40));
    let (e10, e20, e40) = ((h10 - exact).abs(), (h20 - exact).abs(), (h40 - exact).abs());
    let (r1, r2) = (e10 / e20, e20 / e40);
    assert!(
        (3.5..4.5).contains(&r1) && (3.5..4.5).contains(&r2),
        "ratios {r1} {r2}; H = {h10} {h20} {h40} vs {exact}"
    );
    let h_inf = h40 + (h40 - h20) / 3.0;
    assert!(rel(h_inf, exact) < 1e-6, "extrapolated H = {h_inf} vs {exact}");
}

/// Mid-span sag of a level elastic catenary (Irvine 1981, ch. 1):
/// `d = w L0²/(8 EA) + (H/w)(√(1 + (w L0/(2H))²) − 1)`, reported by the member to 1e-9.
#[test]
fn mid_span_sag_of_a_level_cable_matches_irvine() {
    let (span, length, ea, w, g) = (100.0, 101.0, 1e7, 10.0, 9.81);
    let eq = solve(&model(&hanging_chain(1, span, length, ea, w, g, 0.0)));
    let sag = eq.members[0].sag.as_ref().unwrap();
    let h = sag.horizontal;
    let d = w * length * length / (8.0 * ea) + h / w * ((1.0 + (w * length / (2.0 * h)).powi(2)).sqrt() - 1.0);
    assert!((sag.mid_span_sag - d).abs() < 1e-9 * span, "{} vs {d}", sag.mid_span_sag);
    // The REFERENCES check value.
    assert!((d - 6.20867).abs() < 1e-5, "{d}");
    // Level: the largest distance from the chord is at mid-span too.
    assert!((sag.sag - d).abs() < 1e-9 * span);
    assert!(rel(sag.tension_a, sag.tension_b) < 1e-12, "{} {}", sag.tension_a, sag.tension_b);
}

/// The stiffness of a shallow sagging stay along its chord is Ernst's equivalent modulus:
/// `EA_eq = EA / (1 + (w l)² EA / (12 T³))` over the chord length (Ernst 1965, *Der
/// Bauingenieur* 40(2), from memory; shared REFERENCES §2). The formula is the parabolic
/// approximation for a level stay, neglecting terms of relative order 8 (d/l)² and T/EA (each
/// below 1e-3 here), so the check is to 2e-3 at a sag d of about 1 % of the span, where the
/// sag term makes the stay about twice as soft as EA/L.
#[test]
fn chord_stiffness_of_a_shallow_stay_is_ernsts_equivalent_modulus() {
    let (ea, q, span) = (2e8, 40.0, 200.0);
    // Tension giving a sag of about 1 % (T ≈ w l²/(8 d) = 100 kN), then the cable that has it.
    let t = 100_000.0;
    let l0 = rigwright_core::element::catenary::rest_length_for(
        ea,
        q,
        span,
        0.0,
        rigwright_core::element::catenary::GivenTension::Horizontal(t),
    )
    .unwrap();
    let kind = MemberKind::Cable { ea, l0 };
    let gravity = Vec3::new(0.0, 0.0, -9.81);
    let chord = Vec3::new(span, 0.0, 0.0);
    let r = respond(&kind, q / 9.81, &chord, &gravity, &Vec3::zeros()).unwrap();
    let k = r.elastic + r.geometric;
    let along = k[(0, 0)];
    let ernst = ea / (1.0 + (q * span).powi(2) * ea / (12.0 * t.powi(3))) / span;
    assert!(ernst < 0.5 * ea / span, "the sag term matters here");
    assert!(rel(along, ernst) < 2e-3, "chord stiffness {along} vs Ernst {ernst} N/m");
}

/// The 3×3 tangent of the catenary member is the derivative of its end force, checked to 1e-6
/// by Richardson-extrapolated central differences on random cables in random orientations in 3D (gravity along −z and
/// along a tilted direction), from nearly taut to deep sag.
#[test]
fn catenary_tangent_matches_central_differences_in_3d() {
    let mut seed = 0x2545_f491_4f6c_dd1du64;
    let mut next = || {
        seed ^= seed << 13;
        seed ^= seed >> 7;
        seed ^= seed << 17;
        (seed >> 11) as f64 / (1u64 << 53) as f64
    };
    let mut checked = 0;
    for trial in 0..400 {
        let ea = 10f64.powf(4.0 + 4.0 * next());
        let mpl = 10f64.powf(-2.0 + 2.0 * next());
        let gravity = if trial % 2 == 0 {
            Vec3::new(0.0, 0.0, -9.81)
        } else {
            Vec3::new(0.3, -9.7, 1.1)
        };
        let dir = Vec3::new(next() - 0.5, next() - 0.5, next() - 0.5);
        if dir.norm() < 1e-3 {
            continue;
        }
        let chord_len = 1.0 + 50.0 * next();
        let chord = dir.normalize() * chord_len;
        // From 0.99 (stretched taut) to 3 times the chord (deep sag).
        let l0 = chord_len * (0.99 + 2.0 * next().powi(2));
        let kind = MemberKind::Cable { ea, l0 };
        let Some(r) = respond(&kind, mpl, &chord, &gravity, &Vec3::zeros()) else {
            panic!("no catenary for chord {chord:?}, L0 {l0}");
        };
        let k = r.elastic + r.geometric;
        let scale = k.abs().max();
        for j in 0..3 {
            // Central differences at h and h/2, Richardson-extrapolated (error O(h⁴)): a nearly
            // taut cable's stiffness changes over a chord change of millimetres.
            let central = |h: f64| {
                let mut cp = chord;
                cp[j] += h;
                let mut cm = chord;
                cm[j] -= h;
                let fp = respond(&kind, mpl, &cp, &gravity, &Vec3::zeros()).unwrap().end_b;
                let fm = respond(&kind, mpl, &cm, &gravity, &Vec3::zeros()).unwrap().end_b;
                (fp - fm) / (2.0 * h)
            };
            let h = 1e-6 * chord_len;
            let fd = (central(0.5 * h) * 4.0 - central(h)) / 3.0;
            for i in 0..3 {
                assert!(
                    (fd[i] - k[(i, j)]).abs() <= 1e-6 * scale,
                    "trial {trial}: K[{i},{j}] = {} vs FD {} (scale {scale}); EA {ea} m' {mpl} L0/L {}",
                    k[(i, j)],
                    fd[i],
                    l0 / chord_len
                );
            }
        }
        // Symmetric (it is the Hessian of the member's energy).
        assert!((k - k.transpose()).abs().max() <= 1e-9 * scale);
        checked += 1;
    }
    assert!(checked > 390);
}

/// A sagging member in a rig: gravity loads on the cable, warm starts and the stability
/// verdict all work through `Statics`, and the anchors share the cable's weight the way the
/// closed form says (upper end more).
#[test]
fn anchors_of_an_inclined_span_share_its_weight_as_the_closed_form_says() {
    let (h, v, w, ea, l0, g) = (800.0, -200.0, 10.0, 1e6, 60.0, 9.81);
    let (x, z) = irvine_end(h, v, w, ea, l0);
    // Both ends anchored at Irvine's positions, with a light free mass hung on a stiff spring
    // from end b so that the rig has something to solve.
    let mut p = loaded_cable(h, v, w, ea, l0, g);
    p.nodes[1].at = (x, z, 0.0);
    p.nodes[1].fixed = [true; 3];
    p.cases[0].loads.clear();
    p.nodes.push(NodeDoc {
        id: "m".into(),
        at: (x, z - 1.0, 0.0),
        mass: 0.1,
        fixed: [false; 3],
    });
    p.members.push(MemberDoc {
        id: "s".into(),
        ends: ("b".into(), "m".into()),
        kind: MemberDocKind::Spring {
            rate: 1e4,
            rest: Rest::Length(1.0),
        },
        mass_per_length: 0.0,
        design: None,
    });
    let m = model(&p);
    let eq = Statics::new(&m).solve(0, None).unwrap();
    let ra = eq.nodes[0].reaction.unwrap();
    let rb = eq.nodes[1].reaction.unwrap();
    let t = h.hypot(v);
    assert!((ra.x + h).abs() < 1e-8 * t && (ra.y + v).abs() < 1e-8 * t, "{ra:?}");
    // End b: the cable's pull (H, V + w L0) back towards a, plus the spring's 0.1 kg.
    let spring = 0.1 * g;
    assert!(
        (rb.x - h).abs() < 1e-8 * t && (rb.y - (v + w * l0) - spring).abs() < 1e-8 * t,
        "{rb:?}"
    );
}

/// A cable hanging on a vertical chord with a mass at its lower end: statics alone give the end
/// tensions `T_lo = m g` and `T_hi = m g + w L0`; Hooke's law integrated along the cable gives
/// the stretched length and the stiffness along it, `EA/L0`; and Irvine's span equation at
/// vanishing horizontal tension, `x = H ∫ (1/T + 1/EA) ds`, gives the stiffness across it,
/// `1/(ln(T_hi/T_lo)/w + L0/EA)` (which tends to the pendulum's `T/L` as `w → 0`). The member
/// on the exact vertical and 1e-7 rad off it agree with these; with no tension at its
/// free end (a cable dangling from an anchor) the stiffness across is nil.
#[test]
fn a_cable_on_a_vertical_chord_has_the_closed_form_forces_and_stiffness() {
    let (ea, l0, mpl, mass, g) = (1e6, 10.0, 2.0, 5.0, 9.81);
    let w = mpl * g;
    let gravity = Vec3::new(0.0, 0.0, -g);
    let kind = MemberKind::Cable { ea, l0 };
    let (t_lo, t_hi) = (mass * g, mass * g + w * l0);
    let drop = l0 + (t_lo * l0 + 0.5 * w * l0 * l0) / ea;
    let across = 1.0 / ((t_hi / t_lo).ln() / w + l0 / ea);
    assert!(rel(across, t_lo / drop) > 0.1, "the cable's weight matters here");
    for tilt in [0.0, 1e-7] {
        // Tilted at constant chord length (a shorter rise would slacken the cable by the tilt²).
        let chord = Vec3::new(tilt * drop, 0.0, -drop * (1.0 - tilt * tilt).sqrt());
        let r = respond(&kind, mpl, &chord, &gravity, &Vec3::zeros()).unwrap();
        assert!(rel(r.end_b.z, -t_lo) < 1e-9, "lower end {} vs {t_lo} N", r.end_b.z);
        assert!(rel(r.end_a.z, t_hi) < 1e-9, "upper end {} vs {t_hi} N", r.end_a.z);
        assert!(rel(r.force, t_hi) < 1e-9);
        let k = r.elastic + r.geometric;
        assert!(rel(k[(2, 2)], ea / l0) < 1e-6, "along {} vs {} N/m", k[(2, 2)], ea / l0);
        assert!(rel(k[(1, 1)], across) < 1e-6, "across {} vs {across} N/m", k[(1, 1)]);
        assert!(rel(k[(0, 0)], across) < 1e-6, "across {} vs {across} N/m", k[(0, 0)]);
    }
    let dangling = Vec3::new(0.0, 0.0, -(l0 + 0.5 * w * l0 * l0 / ea));
    let r = respond(&kind, mpl, &dangling, &gravity, &Vec3::zeros()).unwrap();
    assert!(r.end_b.norm() < 1e-6 * w * l0, "a free end carries nothing: {}", r.end_b);
    let k = r.elastic + r.geometric;
    assert!(k[(0, 0)].abs() < 1e-9 && k[(1, 1)].abs() < 1e-9, "nothing across: {k}");
}

/// The sample guyed pole: the top's lateral stiffness with the guys as catenary members,
/// (1) against the closed-form equivalent-modulus approximation of Ernst (1965; from memory,
/// shared REFERENCES §2): each guy a straight bar of tangent stiffness
/// `EA/L / (1 + (w l_h)² EA/(12 T³))` (`l_h` its horizontal span, `T` its tension along the
/// chord) with the geometric stiffness `T/L` across it, and the pole's `−P/L`; Ernst's form
/// holds to first order in the weight's effect, here about 6 %, so to about (6 %)² ≈ 0.4 %;
/// (2) against the same pole with each guy a chain of N straight links carrying its weight
/// lumped at the joints, whose error falls as 1/N² (Richardson from N = 16, 32, 64 to 1e-6).
#[test]
fn a_guyed_poles_top_has_the_stiffness_of_ernsts_modulus_and_of_the_chain() {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR")).join("../sample-projects/guyed-pole.rig.ron");
    let project = Project::load(&path).unwrap();
    let m = model(&project);
    let statics = Statics::new(&m);
    let eq = statics.solve(0, None).unwrap();
    let top = m.node_index("top").unwrap();
    let k_top = statics.node_stiffness(&eq, top).unwrap();
    let x = Vec3::x();
    let exact = k_top.along(&x);
    // (1) Ernst.
    let up = Vec3::y();
    let mut ernst = 0.0;
    for (mm, r) in m.members.iter().zip(&eq.members) {
        let [a, b] = mm.ends;
        let d = eq.nodes[b].position - eq.nodes[a].position;
        let l = d.norm();
        let e = d / l;
        match mm.kind {
            MemberKind::Cable { ea, l0 } => {
                let s = r.sag.as_ref().unwrap();
                let w = mm.mass_per_length * 9.81;
                let lh = (d - up * d.dot(&up)).norm();
                // Tension along the chord: the mean of the ends' components along it.
                let t = 0.5 * (s.tension_a + s.tension_b);
                let k_e = ea / l0 / (1.0 + (w * lh).powi(2) * ea / (12.0 * t.powi(3)));
                ernst += k_e * e.x * e.x + t / l * (1.0 - e.x * e.x);
            }
            MemberKind::Strut { .. } => ernst += r.force / l * (1.0 - e.x * e.x),
            _ => unreachable!(),
        }
    }
    assert!(rel(exact, ernst) < 4e-3, "top stiffness {exact} vs Ernst {ernst} N/m");
    // (2) Chains of lumped links.
    let chained = |links: usize| -> f64 {
        let mut p = project.clone();
        let guys: Vec<usize> = (0..p.members.len()).filter(|&i| p.members[i].id.starts_with("guy")).collect();
        for &gi in guys.iter().rev() {
            let doc = p.members.remove(gi);
            let mi = m.member_index(&doc.id).unwrap();
            let MemberKind::Cable { ea, l0 } = m.members[mi].kind else {
                unreachable!()
            };
            let [a, b] = m.members[mi].ends;
            let (pa, pb) = (m.nodes[a].position, m.nodes[b].position);
            let joint = doc.mass_per_length * l0 / links as f64;
            let mut prev = doc.ends.0.clone();
            for k in 1..=links {
                let next = if k == links {
                    doc.ends.1.clone()
                } else {
                    let id = format!("{}-{k}", doc.id);
                    let at = pa + (pb - pa) * (k as f64 / links as f64);
                    p.nodes.push(NodeDoc {
                        id: id.clone(),
                        at: (at.x, at.y, at.z),
                        mass: joint,
                        fixed: [false; 3],
                    });
                    id
                };
                p.members.push(MemberDoc {
                    id: format!("{}-link{k}", doc.id),
                    ends: (prev.clone(), next.clone()),
                    kind: MemberDocKind::Cable {
                        ea,
                        rest: Rest::Length(l0 / links as f64),
                    },
                    mass_per_length: 0.0,
                    design: None,
                });
                prev = next;
            }
            // The top carries half a joint's mass of each guy.
            let t = p.nodes.iter_mut().find(|n| n.id == "top").unwrap();
            t.mass += 0.5 * joint;
        }
        let cm = model(&p);
        let st = Statics::new(&cm);
        let ceq = st.solve(0, None).unwrap();
        assert!(ceq.stability.is_stable(), "{links} links: {:?}", ceq.stability);
        st.node_stiffness(&ceq, cm.node_index("top").unwrap()).unwrap().along(&x)
    };
    let (k16, k32, k64) = (chained(16), chained(32), chained(64));
    let ratio = (k32 - k16) / (k64 - k32);
    assert!(
        (3.5..4.5).contains(&ratio),
        "chain convergence ratio {ratio}: {k16}, {k32}, {k64} N/m"
    );
    let richardson = k64 + (k64 - k32) / 3.0;
    assert!(
        rel(richardson, exact) < 1e-6,
        "chains → {richardson} vs catenary members {exact} N/m"
    );
}

/// An inclined span with large sag (chord 80 m across and 30 m up, cable 100 m: its lowest
/// point lies between the ends): a chain of N straight weightless links with the weight
/// lumped at the joints converges to the one catenary member as 1/N² — Richardson from
/// N = 20, 40, 80 gives the anchor forces to 1e-6.
#[test]
fn an_inclined_deep_span_of_lumped_links_converges_to_the_catenary_member() {
    let (span, rise, length, ea, w, g) = (80.0, 30.0, 100.0, 2e7, 15.0, 9.81);
    let incline = |mut p: Project, lumped: Option<usize>| {
        for n in &mut p.nodes {
            n.at.1 += rise * n.at.0 / span;
        }
        if let Some(links) = lumped {
            let joint = w / g * length / links as f64;
            for m in &mut p.members {
                m.mass_per_length = 0.0;
            }
            for (k, n) in p.nodes.iter_mut().enumerate() {
                n.mass = if k == 0 || k == links { 0.5 } else { 1.0 } * joint;
            }
        }
        let eq = solve(&model(&p));
        assert!(eq.stability.is_stable(), "{:?}", eq.stability);
        let r = eq.nodes[0].reaction.unwrap();
        (r.x, r.y)
    };
    let exact = incline(hanging_chain(1, span, length, ea, w, g, 0.0), None);
    let low = |links: usize| incline(hanging_chain(links, span, length, ea, w, g, 20.0), Some(links));
    let (c20, c40, c80) = (low(20), low(40), low(80));
    for (k, (a, b, c, e)) in [(c20.0, c40.0, c80.0, exact.0), (c20.1, c40.1, c80.1, exact.1)]
        .into_iter()
        .enumerate()
    {
        let ratio = (b - a) / (c - b);
        assert!((3.5..4.5).contains(&ratio), "component {k}: ratio {ratio} ({a}, {b}, {c})");
        let richardson = c + (c - b) / 3.0;
        assert!(rel(richardson, e) < 1e-6, "component {k}: chains → {richardson} vs member {e} N");
    }
    // The lowest point lies between the ends: the cable leaves the lower anchor downwards, so
    // the anchor holds it up.
    assert!(exact.1 > 0.0, "lower anchor's reaction {exact:?} N");
}

/// Nearly taut, nearly weightless: a cable whose weight is 1e-8 of its tension is a
/// catenary (above the floor below which weight is ignored), and its end forces are those of
/// the straight elastic cable with half its weight at each end, to within the weight's own
/// second-order effect — the closed form does not lose accuracy as the sag vanishes (common
/// practice: the limit of the exact solution).
#[test]
fn a_nearly_weightless_catenary_is_the_straight_cable() {
    let gravity = Vec3::new(0.0, 0.0, -9.81);
    let up = Vec3::z();
    for (ea, strain) in [(1e5, 1e-2), (1e7, 1e-3), (1e9, 1e-3)] {
        for dir in [Vec3::new(1.0, 0.0, 0.0), Vec3::new(0.6, 0.0, 0.8), Vec3::new(0.3, -0.5, -0.81)] {
            let chord = dir.normalize() * 20.0;
            let l0 = chord.norm() / (1.0 + strain);
            let t = ea * strain;
            let mpl = 1e-8 * t / (9.81 * l0);
            let w = mpl * 9.81 * l0;
            let kind = MemberKind::Cable { ea, l0 };
            let cat = respond(&kind, mpl, &chord, &gravity, &Vec3::zeros()).unwrap();
            assert!(cat.sag.is_some(), "above the weight floor it is a catenary");
            let straight = respond(&kind, 0.0, &chord, &gravity, &Vec3::zeros()).unwrap();
            // Each end carries half the weight (internal forces: end_a + end_b = w up).
            for (c, s) in [(cat.end_a, straight.end_a), (cat.end_b, straight.end_b)] {
                let expected = s + up * (0.5 * w);
                assert!(
                    (c - expected).norm() <= 1e-6 * w + 1e-13 * t,
                    "EA {ea}, chord {chord}: {c} vs straight {expected} (weight {w} N)"
                );
            }
        }
    }
}
