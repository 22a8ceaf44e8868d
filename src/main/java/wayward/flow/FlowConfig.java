package wayward.flow;


/**
 * The {@code [flow]} table.
 *
 * @param levels           pyramid levels, 0 = chosen from the analysis size
 * @param iterations       most refinement steps per point on the coarser levels
 * @param finestIterations most refinement steps per point on the full-size level
 * @param window           side of the square Lucas–Kanade window in pixels (odd)
 * @param regularization   pull towards the current estimate, (grey levels per pixel)² per window pixel
 * @param stride           pixels between solved points on the full-size level (1 = every pixel)
 * @param coarseStride     the same on the coarser levels
 * @param threads          threads sharing one camera's frame (bands)
 * @param skipStill        skip the flow of frames in which nothing changed around the zones (the analysis's
 *                         still-frame gate); off runs it on every analysed frame
 */
public record FlowConfig(int levels, int iterations, int finestIterations, int window, double regularization,
        int stride, int coarseStride, int threads, boolean skipStill) {
    /** Whether the flow of still frames is skipped unless the config says otherwise. */
    public static final boolean DEFAULT_SKIP_STILL = true;
    public static final FlowConfig DEFAULTS = from(FlowSettings.defaults());

    /** The estimator's settings with the still-frame gate on (the default). */
    public FlowConfig(int levels, int iterations, int finestIterations, int window, double regularization,
            int stride, int coarseStride, int threads) {
        this(levels, iterations, finestIterations, window, regularization, stride, coarseStride, threads,
                DEFAULT_SKIP_STILL);
    }

    private static FlowConfig from(FlowSettings s) {
        return new FlowConfig(s.levels(), s.iterations(), s.finestIterations(), 2 * s.windowRadius() + 1,
                s.regularization(), s.stride(), s.coarseStride(), s.threads());
    }

    public FlowSettings toSettings() {
        return new FlowSettings(levels, iterations, finestIterations, window / 2, (float) regularization, stride,
                coarseStride, threads);
    }
}
