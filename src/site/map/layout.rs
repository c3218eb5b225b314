//! Layered drawing of a directed graph: the one place that decides where
//! boxes go, so another engine can be swapped in behind [`layered`].
//!
//! We checked the registry's layered-layout crate that works on petgraph
//! (rust-sugiyama 0.4.0, MIT): the same graph gave different coordinates
//! in two runs (it iterates `HashMap`s, whose order changes per process),
//! and it took 4.2 s for 300 nodes and 57 s for 600 (release build), far
//! beyond the site's budget. `layout-rs` draws DOT graphs with its own
//! graph type, not petgraph. So this is a compact layered layout of our
//! own, after the method of Sugiyama, Tagawa & Toda (IEEE Trans. SMC 11,
//! 1981):
//!
//! 1. cycles are broken by reversing the back edges of a depth-first search
//!    that visits nodes in index order;
//! 2. layers by longest path from the sources, then each source moved down
//!    to just above its nearest successor (inputs sit by their consumer);
//! 3. edges longer than one layer get a chain of small dummy nodes, so they
//!    have room between boxes;
//! 4. crossing reduction by barycentre sweeps, down and up, keeping the
//!    order with the fewest crossings; ties keep the previous order
//!    (stable sort), so the result depends only on node indices;
//! 5. x by pulling each node towards the mean x of its neighbours, then a
//!    left-to-right pass that restores the minimum gap (so boxes of one
//!    layer never overlap); layers are stacked with a fixed gap, so boxes
//!    of different layers never overlap either; every left edge is then
//!    moved to a whole number (the gaps kept), for short SVG coordinates.
//!
//! Everything is index-ordered (no hash maps): the same graph always gives
//! the same coordinates.

use petgraph::graph::DiGraph;
use petgraph::visit::EdgeRef;

/// Horizontal gap between neighbouring boxes of a layer.
pub const NODE_GAP: f64 = 18.0;
/// Vertical gap between layers (room for arrows and arrowheads).
pub const LAYER_GAP: f64 = 46.0;
/// Width of the slot a dummy node (a bend of a long edge) takes.
const DUMMY_WIDTH: f64 = 10.0;
/// Barycentre sweeps (down + up counts as two).
const SWEEPS: usize = 12;
/// Rounds of pulling nodes towards their neighbours.
const PULL_ROUNDS: usize = 8;

/// A box to place: its size.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Size {
    pub width: f64,
    pub height: f64,
}

/// Where a box went: centre, and its size.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Placed {
    pub x: f64,
    pub y: f64,
    pub width: f64,
    pub height: f64,
    pub layer: usize,
}

impl Placed {
    pub fn left(&self) -> f64 {
        self.x - self.width / 2.0
    }
    pub fn right(&self) -> f64 {
        self.x + self.width / 2.0
    }
    pub fn top(&self) -> f64 {
        self.y - self.height / 2.0
    }
    pub fn bottom(&self) -> f64 {
        self.y + self.height / 2.0
    }
    /// True when the two boxes share interior area.
    pub fn overlaps(&self, other: &Placed) -> bool {
        self.left() < other.right()
            && other.left() < self.right()
            && self.top() < other.bottom()
            && other.top() < self.bottom()
    }
}

/// The drawing: a box per input node, and per input edge the points it
/// passes through (its bends at dummy nodes), from tail to head.
#[derive(Debug, Clone, PartialEq)]
pub struct Layout {
    pub nodes: Vec<Placed>,
    /// Bends of each edge, by input edge index (empty when the edge joins
    /// neighbouring layers). Listed from the edge's tail to its head.
    pub bends: Vec<Vec<(f64, f64)>>,
    pub width: f64,
    pub height: f64,
}

/// Lays out `graph` (node weights are box sizes) top to bottom.
pub fn layered<E>(graph: &DiGraph<Size, E>) -> Layout {
    let n = graph.node_count();
    if n == 0 {
        return Layout {
            nodes: Vec::new(),
            bends: Vec::new(),
            width: 0.0,
            height: 0.0,
        };
    }
    // 1. Acyclic edge list (tail, head, input edge index, reversed?).
    let edges = acyclic_edges(graph);
    // 2. Layers.
    let layer = layers(n, &edges);
    // 3. Dummy chains. Node ids >= n are dummies.
    let mut widths: Vec<f64> = graph.node_weights().map(|s| s.width).collect();
    let mut node_layer = layer.clone();
    // Unit edges between (upper, lower) node ids.
    let mut unit: Vec<(usize, usize)> = Vec::new();
    // Per input edge: its chain of dummies from upper to lower, and whether
    // the chain runs against the edge's direction.
    let mut chains: Vec<(Vec<usize>, bool)> = vec![(Vec::new(), false); graph.edge_count()];
    for &(tail, head, index, reversed) in &edges {
        let mut prev = tail;
        let mut chain = Vec::new();
        for l in layer[tail] + 1..layer[head] {
            let d = widths.len();
            widths.push(DUMMY_WIDTH);
            node_layer.push(l);
            unit.push((prev, d));
            chain.push(d);
            prev = d;
        }
        unit.push((prev, head));
        chains[index] = (chain, reversed);
    }
    let total = widths.len();
    let layer_count = node_layer.iter().max().map_or(0, |m| m + 1);
    let mut up: Vec<Vec<usize>> = vec![Vec::new(); total];
    let mut down: Vec<Vec<usize>> = vec![Vec::new(); total];
    for &(a, b) in &unit {
        down[a].push(b);
        up[b].push(a);
    }
    // 4. Order within layers.
    let mut order = initial_order(total, &node_layer, layer_count, &down, &up);
    reduce_crossings(&mut order, &up, &down);
    // 5. Coordinates.
    let mut heights = vec![0.0f64; layer_count];
    for (v, size) in graph.node_weights().enumerate() {
        heights[layer[v]] = heights[layer[v]].max(size.height);
    }
    let mut layer_y = Vec::with_capacity(layer_count);
    let mut y = 0.0;
    for h in &heights {
        layer_y.push(y + h / 2.0);
        y += h + LAYER_GAP;
    }
    let mut x = x_coordinates(&order, &widths, &up, &down);
    snap_lefts(&order, &widths, &mut x);
    let min_left = (0..total)
        .map(|v| x[v] - widths[v] / 2.0)
        .fold(f64::INFINITY, f64::min);
    let shift = -min_left;
    let width = (0..total)
        .map(|v| x[v] + widths[v] / 2.0 + shift)
        .fold(0.0, f64::max);
    let nodes = graph
        .node_weights()
        .enumerate()
        .map(|(v, size)| Placed {
            x: round2(x[v] + shift),
            y: round2(layer_y[layer[v]]),
            width: size.width,
            height: size.height,
            layer: layer[v],
        })
        .collect();
    let bends = chains
        .into_iter()
        .map(|(chain, reversed)| {
            let mut points: Vec<(f64, f64)> = chain
                .iter()
                .map(|&d| (round2(x[d] + shift), round2(layer_y[node_layer[d]])))
                .collect();
            if reversed {
                points.reverse();
            }
            points
        })
        .collect();
    Layout {
        nodes,
        bends,
        width: round2(width),
        height: round2(y - LAYER_GAP),
    }
}

fn round2(v: f64) -> f64 {
    (v * 100.0).round() / 100.0 + 0.0
}

/// Edges as (upper, lower, input index, reversed), with the back edges of a
/// depth-first search (nodes in index order) turned round. Self loops are
/// dropped (none occur in our bipartite maps).
fn acyclic_edges<E>(graph: &DiGraph<Size, E>) -> Vec<(usize, usize, usize, bool)> {
    let n = graph.node_count();
    // Outgoing edges per node in edge-index order.
    let mut out: Vec<Vec<(usize, usize)>> = vec![Vec::new(); n];
    for e in graph.edge_references() {
        out[e.source().index()].push((e.target().index(), e.id().index()));
    }
    for list in &mut out {
        list.sort_unstable();
    }
    // 0 = new, 1 = on stack, 2 = done.
    let mut state = vec![0u8; n];
    let mut back = vec![false; graph.edge_count()];
    for start in 0..n {
        if state[start] != 0 {
            continue;
        }
        let mut stack = vec![(start, 0usize)];
        state[start] = 1;
        while let Some(&mut (v, ref mut next)) = stack.last_mut() {
            if let Some(&(w, e)) = out[v].get(*next) {
                *next += 1;
                match state[w] {
                    0 => {
                        state[w] = 1;
                        stack.push((w, 0));
                    }
                    1 => back[e] = true,
                    _ => {}
                }
            } else {
                state[v] = 2;
                stack.pop();
            }
        }
    }
    graph
        .edge_references()
        .filter(|e| e.source() != e.target())
        .map(|e| {
            let (a, b) = (e.source().index(), e.target().index());
            let i = e.id().index();
            if back[i] {
                (b, a, i, true)
            } else {
                (a, b, i, false)
            }
        })
        .collect()
}

/// Longest-path layers, then sources pulled down next to their successors.
fn layers(n: usize, edges: &[(usize, usize, usize, bool)]) -> Vec<usize> {
    let mut succ: Vec<Vec<usize>> = vec![Vec::new(); n];
    let mut indegree = vec![0usize; n];
    for &(a, b, _, _) in edges {
        succ[a].push(b);
        indegree[b] += 1;
    }
    let mut layer = vec![0usize; n];
    // Kahn's algorithm, smallest index first (a sorted stack of ready nodes).
    let mut ready: std::collections::BTreeSet<usize> =
        (0..n).filter(|&v| indegree[v] == 0).collect();
    let mut remaining = indegree.clone();
    while let Some(v) = ready.pop_first() {
        for &w in &succ[v] {
            layer[w] = layer[w].max(layer[v] + 1);
            remaining[w] -= 1;
            if remaining[w] == 0 {
                ready.insert(w);
            }
        }
    }
    for v in 0..n {
        if indegree[v] == 0 {
            if let Some(nearest) = succ[v].iter().map(|&w| layer[w]).min() {
                layer[v] = nearest.saturating_sub(1).max(layer[v]);
            }
        }
    }
    layer
}

/// First order: nodes in each layer by a depth-first walk from the top
/// layer in index order, so connected nodes start near each other.
fn initial_order(
    total: usize,
    node_layer: &[usize],
    layer_count: usize,
    down: &[Vec<usize>],
    up: &[Vec<usize>],
) -> Vec<Vec<usize>> {
    let mut order: Vec<Vec<usize>> = vec![Vec::new(); layer_count];
    let mut seen = vec![false; total];
    let mut starts: Vec<usize> = (0..total).collect();
    starts.sort_by_key(|&v| (node_layer[v], v));
    for start in starts {
        if seen[start] {
            continue;
        }
        let mut stack = vec![start];
        seen[start] = true;
        while let Some(v) = stack.pop() {
            order[node_layer[v]].push(v);
            // Reverse so the smallest neighbour is visited first.
            for &w in down[v].iter().chain(&up[v]).rev() {
                if !seen[w] {
                    seen[w] = true;
                    stack.push(w);
                }
            }
        }
    }
    order
}

/// Barycentre sweeps; keeps the order with the fewest crossings seen.
/// Stops early when nothing can change any more: no crossings left, or a
/// down-and-up pair of sweeps that left the order as it was (the sweeps
/// depend on the order only, so later ones would repeat it).
fn reduce_crossings(order: &mut [Vec<usize>], up: &[Vec<usize>], down: &[Vec<usize>]) {
    let total = up.len();
    let mut position = vec![0usize; total];
    for layer in order.iter() {
        for (i, &v) in layer.iter().enumerate() {
            position[v] = i;
        }
    }
    let mut pairs = Vec::new();
    let mut best_crossings = crossings(order, down, &position, &mut pairs);
    if best_crossings == 0 {
        return;
    }
    let mut best = order.to_vec();
    let mut keyed: Vec<(f64, usize)> = Vec::new();
    let mut before = order.to_vec();
    for sweep in 0..SWEEPS {
        let downward = sweep % 2 == 0;
        if downward {
            before.clone_from_slice(order);
        }
        let count = order.len();
        for step in 0..count.saturating_sub(1) {
            let l = if downward { step + 1 } else { count - 2 - step };
            let neighbours = if downward { up } else { down };
            keyed.clear();
            keyed.extend(order[l].iter().map(|&v| {
                let ns = &neighbours[v];
                let key = if ns.is_empty() {
                    position[v] as f64
                } else {
                    ns.iter().map(|&w| position[w] as f64).sum::<f64>() / ns.len() as f64
                };
                (key, v)
            }));
            // Stable: equal keys keep their current order.
            keyed.sort_by(|a, b| a.0.total_cmp(&b.0));
            for (i, &(_, v)) in keyed.iter().enumerate() {
                order[l][i] = v;
                position[v] = i;
            }
        }
        let c = crossings(order, down, &position, &mut pairs);
        if c < best_crossings {
            best_crossings = c;
            best.clone_from_slice(order);
        }
        if best_crossings == 0 || (!downward && before == order) {
            break;
        }
    }
    order.clone_from_slice(&best);
}

/// Edge crossings between neighbouring layers (pairwise count, fine for the
/// readable sizes we draw); `pairs` is scratch space.
fn crossings(
    order: &[Vec<usize>],
    down: &[Vec<usize>],
    position: &[usize],
    pairs: &mut Vec<(usize, usize)>,
) -> usize {
    let mut count = 0;
    for layer in order {
        pairs.clear();
        for &v in layer {
            for &w in &down[v] {
                pairs.push((position[v], position[w]));
            }
        }
        for i in 0..pairs.len() {
            for j in i + 1..pairs.len() {
                let (a, b) = (pairs[i], pairs[j]);
                if (a.0 < b.0 && a.1 > b.1) || (a.0 > b.0 && a.1 < b.1) {
                    count += 1;
                }
            }
        }
    }
    count
}

/// Centre x of every node: packed, then pulled towards neighbours with the
/// order and the minimum gaps kept.
fn x_coordinates(
    order: &[Vec<usize>],
    widths: &[f64],
    up: &[Vec<usize>],
    down: &[Vec<usize>],
) -> Vec<f64> {
    let mut x = vec![0.0; widths.len()];
    for layer in order {
        let mut left = 0.0;
        for &v in layer {
            x[v] = left + widths[v] / 2.0;
            left += widths[v] + NODE_GAP;
        }
    }
    let mut desired: Vec<f64> = Vec::new();
    for round in 0..PULL_ROUNDS {
        let downward = round % 2 == 0;
        for step in 0..order.len() {
            let l = if downward {
                step
            } else {
                order.len() - 1 - step
            };
            desired.clear();
            desired.extend(order[l].iter().map(|&v| {
                let n = up[v].len() + down[v].len();
                if n == 0 {
                    x[v]
                } else {
                    up[v].iter().chain(&down[v]).map(|&w| x[w]).sum::<f64>() / n as f64
                }
            }));
            place_in_order(&order[l], &desired, widths, &mut x);
        }
    }
    x
}

/// Moves every box to a whole-number left edge (short coordinates in the
/// SVG), keeping the order and at least [`NODE_GAP`] between neighbours.
fn snap_lefts(order: &[Vec<usize>], widths: &[f64], x: &mut [f64]) {
    for layer in order {
        let mut min_left = f64::NEG_INFINITY;
        for &v in layer {
            let left = (x[v] - widths[v] / 2.0).round().max(min_left);
            x[v] = left + widths[v] / 2.0;
            min_left = (left + widths[v] + NODE_GAP).ceil();
        }
    }
}

/// Puts the nodes of one layer as near their desired x as the order and the
/// gaps allow: a right-to-left pass then a left-to-right pass (which alone
/// guarantees the gaps).
fn place_in_order(layer: &[usize], desired: &[f64], widths: &[f64], x: &mut [f64]) {
    let k = layer.len();
    let mut pos: Vec<f64> = desired.to_vec();
    for i in (0..k.saturating_sub(1)).rev() {
        let (v, w) = (layer[i], layer[i + 1]);
        let limit = pos[i + 1] - widths[w] / 2.0 - NODE_GAP - widths[v] / 2.0;
        pos[i] = pos[i].min(limit);
    }
    for i in 1..k {
        let (v, w) = (layer[i - 1], layer[i]);
        let limit = pos[i - 1] + widths[v] / 2.0 + NODE_GAP + widths[w] / 2.0;
        if pos[i] < limit {
            pos[i] = limit;
        }
    }
    for (i, &v) in layer.iter().enumerate() {
        x[v] = pos[i];
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use petgraph::graph::NodeIndex;

    fn size(w: f64) -> Size {
        Size {
            width: w,
            height: 20.0,
        }
    }

    #[test]
    fn chain_runs_top_to_bottom_and_cycle_is_broken() {
        let mut g: DiGraph<Size, ()> = DiGraph::new();
        let a = g.add_node(size(40.0));
        let b = g.add_node(size(40.0));
        let c = g.add_node(size(40.0));
        g.add_edge(a, b, ());
        g.add_edge(b, c, ());
        g.add_edge(c, a, ());
        let l = layered(&g);
        assert_eq!(
            l.nodes.iter().map(|p| p.layer).collect::<Vec<_>>(),
            [0, 1, 2]
        );
        assert!(l.nodes[0].y < l.nodes[1].y && l.nodes[1].y < l.nodes[2].y);
        // The closing edge c→a spans two layers: one bend, listed c first.
        assert_eq!(l.bends[2].len(), 1);
    }

    #[test]
    fn boxes_of_a_layer_keep_their_gap() {
        let mut g: DiGraph<Size, ()> = DiGraph::new();
        let top = g.add_node(size(30.0));
        let kids: Vec<NodeIndex> = (0..6)
            .map(|i| g.add_node(size(20.0 + 10.0 * i as f64)))
            .collect();
        for &k in &kids {
            g.add_edge(top, k, ());
        }
        let l = layered(&g);
        let mut row: Vec<&Placed> = kids.iter().map(|k| &l.nodes[k.index()]).collect();
        row.sort_by(|a, b| a.x.total_cmp(&b.x));
        for pair in row.windows(2) {
            assert!(
                pair[1].left() - pair[0].right() >= NODE_GAP - 1e-6,
                "{pair:?}"
            );
        }
        assert!(l
            .nodes
            .iter()
            .all(|p| p.left() >= -1e-6 && p.right() <= l.width + 1e-6));
    }

    #[test]
    fn barycentre_removes_an_avoidable_crossing() {
        // a→d, b→c with c placed before d initially would cross; the sweep
        // puts the children under their parents.
        let mut g: DiGraph<Size, ()> = DiGraph::new();
        let a = g.add_node(size(30.0));
        let b = g.add_node(size(30.0));
        let c = g.add_node(size(30.0));
        let d = g.add_node(size(30.0));
        g.add_edge(b, c, ());
        g.add_edge(a, d, ());
        g.add_edge(a, c, ());
        let l = layered(&g);
        let x = |v: NodeIndex| l.nodes[v.index()].x;
        // a and d are joined only to each other and c: no crossing means
        // the order of parents matches the order of children.
        assert_eq!(x(a) < x(b), x(d) < x(c), "{l:?}");
    }
}
