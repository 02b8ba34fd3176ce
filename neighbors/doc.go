// Package neighbors is the spatial index of unfold: an exact kd-tree over points or delay
// vectors with the Euclidean or the maximum (Chebyshev) norm, Theiler-window exclusion, index
// range restrictions, k-nearest-neighbour, fixed-radius and counting queries, a pair-distance
// histogram over many radii in one traversal, and parallel all-points drivers whose results do
// not depend on the number of goroutines.
//
// The tree is a flat-array kd-tree: the points are copied contiguously in tree order, an int32
// permutation maps tree positions to the caller's numbering, leaves hold at most 32 points and
// every node splits its points at the median of its widest dimension. Each node keeps its tight
// bounding box and the range of original indices it contains, so whole subtrees can be pruned,
// counted without visiting their points, or skipped when every point in them is excluded.
// Searches prune on squared distances (Euclidean norm) or on the largest coordinate difference
// (maximum norm) and are exact: lower and upper bounds are computed with the same rounded
// operations as the point distances, so no pair is ever misclassified near a radius.
//
// Costs (N points of dimension m): building, O(N log N · m) (rows are reordered in place, so
// every pass reads memory sequentially); a k-nearest-neighbour or radius query, O(log N) on
// low-dimensional data; AllKNN, N queries (for k = 1 the queries of one leaf share one
// traversal); PairCounts, all N(N−1)/2 pairs in one dual-tree pass, counting whole node pairs
// that fall between two radii; ReferencePairCounts and ReferencePairCountsUntil, one
// multi-radius traversal per reference point, R·(log N + points near the radius spheres).
// Memory is O(N · m) for every index.
//
// Theiler's window excludes temporally correlated points: with window w, candidates j with
// |i−j| ≤ w are ignored when searching around point i (w = 0 excludes only i itself). The test
// is an integer comparison in the leaf loop.
//
// Ties are broken by index: results are sorted by (distance, index), where for the Euclidean
// norm the distance compared is the computed squared distance, and the reported Dist is its
// square root.
//
// References:
//   - J. L. Bentley (1975), "Multidimensional binary search trees used for associative
//     searching", Communications of the ACM 18(9), 509–517 (the kd-tree).
//   - J. H. Friedman, J. L. Bentley and R. A. Finkel (1977), "An algorithm for finding best
//     matches in logarithmic expected time", ACM Transactions on Mathematical Software 3(3),
//     209–226 (median split on the widest dimension, bucket leaves, bounds-overlap pruning).
//   - S. Arya and D. M. Mount (1993), "Algorithms for fast vector quantization", Proc. Data
//     Compression Conference, 381–390 (incremental distance to the cell during descent).
//   - A. G. Gray and A. W. Moore (2001), "'N-body' problems in statistical learning", Advances
//     in Neural Information Processing Systems 13 (dual-tree counting of pairs within r).
//   - J. Theiler (1986), "Spurious dimension from correlation algorithms applied to limited
//     time-series data", Physical Review A 34(3), 2427–2432 (the exclusion window).
//   - P. Grassberger and I. Procaccia (1983), "Characterization of strange attractors",
//     Physical Review Letters 50(5), 346–349 (pair counts for correlation sums).
package neighbors
