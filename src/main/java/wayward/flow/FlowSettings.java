package wayward.flow;

/**
 * Parameters of the pyramidal Lucas–Kanade estimator.
 *
 * @param levels         pyramid levels including the full-size one; 0 picks as many as keep the coarsest
 *                       level at least {@link #MIN_LEVEL_SIZE} pixels on its short side (at most 5)
 * @param iterations     most refinement steps (warp, linearise, solve) per point on the coarser levels
 * @param finestIterations most refinement steps per point on the full-size level
 * @param windowRadius   half size of the square window; 2 gives the textbook 5×5 window
 * @param regularization weight pulling each solve towards the current estimate, in (grey levels per
 *                       pixel)² per window pixel; keeps flat areas from producing wild vectors
 * @param stride         distance in pixels between the points where the flow is solved on the full-size
 *                       level; 1 solves at every pixel (dense estimator with box sums)
 * @param coarseStride   the same on the coarser levels, in their own pixels (grid estimator only)
 * @param threads        threads that share one frame's work, in horizontal bands (1 = the calling thread only)
 */
public record FlowSettings(int levels, int iterations, int finestIterations, int windowRadius,
        float regularization, int stride, int coarseStride, int threads) {
    /** The short side of the coarsest level chosen by {@code levels = 0}. */
    public static final int MIN_LEVEL_SIZE = 16;
    /** Upper bound of automatically chosen levels. */
    public static final int MAX_AUTO_LEVELS = 5;

    public static FlowSettings defaults() {
        // measured on the accuracy suite (DEVELOPERS.md): a single step on the full-size level and a sparser
        // grid on the coarse levels are both faster and, with sensor noise, more accurate than more work
        return new FlowSettings(0, 3, 1, 2, 1.0f, 4, 4, 1);
    }

    public FlowSettings withStride(int newStride, int newCoarseStride) {
        return new FlowSettings(levels, iterations, finestIterations, windowRadius, regularization, newStride,
                newCoarseStride, threads);
    }

    public FlowSettings withIterations(int coarse, int finest) {
        return new FlowSettings(levels, coarse, finest, windowRadius, regularization, stride, coarseStride, threads);
    }

    public FlowSettings withWindowRadius(int r) {
        return new FlowSettings(levels, iterations, finestIterations, r, regularization, stride, coarseStride, threads);
    }

    public FlowSettings withLevels(int n) {
        return new FlowSettings(n, iterations, finestIterations, windowRadius, regularization, stride, coarseStride, threads);
    }

    public FlowSettings withThreads(int n) {
        return new FlowSettings(levels, iterations, finestIterations, windowRadius, regularization, stride, coarseStride, n);
    }

    public FlowSettings {
        if (levels < 0 || levels > 8) {
            throw new IllegalArgumentException("levels: " + levels + " (expected 0 to 8)");
        }
        if (iterations < 1 || iterations > 20) {
            throw new IllegalArgumentException("iterations: " + iterations + " (expected 1 to 20)");
        }
        if (windowRadius < 1 || windowRadius > 7) {
            throw new IllegalArgumentException("windowRadius: " + windowRadius + " (expected 1 to 7)");
        }
        if (finestIterations < 1 || finestIterations > 20) {
            throw new IllegalArgumentException("finestIterations: " + finestIterations + " (expected 1 to 20)");
        }
        if (coarseStride < 1 || coarseStride > 32) {
            throw new IllegalArgumentException("coarseStride: " + coarseStride + " (expected 1 to 32)");
        }
        if (stride < 1 || stride > 16) {
            throw new IllegalArgumentException("stride: " + stride + " (expected 1 to 16)");
        }
        if (threads < 1 || threads > 64) {
            throw new IllegalArgumentException("threads: " + threads + " (expected 1 to 64)");
        }
        if (!(regularization >= 0f) || regularization > 1000f) {
            throw new IllegalArgumentException("regularization: " + regularization + " (expected 0 to 1000)");
        }
    }

    /** Levels actually used for a frame of the given size (at least 1). */
    public int levelsFor(int width, int height) {
        int shortSide = Math.min(width, height);
        int fit = 1;
        while (fit < 8 && (shortSide >> fit) >= MIN_LEVEL_SIZE) {
            fit++;
        }
        if (levels == 0) {
            return Math.min(fit, MAX_AUTO_LEVELS);
        }
        int possible = 1;
        while (possible < levels && (shortSide >> possible) >= 2) {
            possible++;
        }
        return possible;
    }
}
