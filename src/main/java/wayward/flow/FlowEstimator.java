package wayward.flow;

/**
 * Dense optical flow between consecutive gray frames of one size. Implementations size every buffer in their
 * constructor and allocate nothing per frame; one instance per analysis thread.
 */
public interface FlowEstimator extends AutoCloseable {
    /**
     * Flow from {@code first} to {@code second} (row-major gray 8-bit, stride = width) into {@code out}.
     * Forgets any frame given to {@link #push}.
     */
    void compute(byte[] first, byte[] second, FlowField out);

    /**
     * Feeds the next frame of a stream: from the second call on writes the flow from the previous frame into
     * {@code out} and returns true; the first call only stores the frame and returns false.
     */
    boolean push(byte[] frame, FlowField out);

    /**
     * Feeds the next frame of a stream in which the caller knows nothing moved: writes zero motion into {@code
     * out} (its texture figures stay those of the last estimate) and keeps the frame as the next pair's earlier
     * one, at the cost of a copy (its pyramid is built only if the next frame is pushed with {@link #push}).
     * Allocates nothing.
     */
    void pushStill(byte[] frame, FlowField out);

    /**
     * The flow from {@code first} to {@code second} at every pixel, for pictures, files and benchmarks (not the
     * analysis loop: allocates a new field). Estimators that solve on a grid fill in the pixels between their
     * points in the way that suits them; by default, bilinear interpolation ({@link FlowField#toDense()}).
     */
    default FlowField computeDense(byte[] first, byte[] second) {
        FlowField grid = newField();
        compute(first, second, grid);
        return grid.toDense();
    }

    /** Drops the stored frame (after a gap); the next {@link #push} starts afresh. */
    void reset();

    /** A field of the shape this estimator writes (its sampling stride over the picture). */
    FlowField newField();

    /** Releases threads the estimator owns (band workers); the estimator is unusable afterwards. */
    @Override
    default void close() {
    }

    /** Pyramid levels in use, including the full-size one. */
    int levelCount();

    /**
     * What the flow runs on in this JVM, one line for the start-up log: the vector kernel and its float lanes, or
     * the scalar code and how to get the vector kernel (java {@code --add-modules jdk.incubator.vector}). Both give
     * the same flow to the bit ({@link FlowKernel}).
     */
    static String instructions() {
        int lanes = FlowKernel.vectorLanes();
        return lanes > 0
                ? "flow: its inner loops run on vector instructions (" + lanes + " float lanes)"
                : "flow: scalar instructions only; java --add-modules jdk.incubator.vector runs the flow's inner"
                        + " loops on vector instructions (same results, about a third less flow time per frame)";
    }

    /**
     * The estimator the settings ask for: {@link GridLucasKanadeFlow} for a stride of 2 or more (the default),
     * {@link LucasKanadeFlow} (every pixel, box sums) for stride 1.
     */
    static FlowEstimator create(int width, int height, FlowSettings settings) {
        return settings.stride() >= 2 ? new GridLucasKanadeFlow(width, height, settings)
                : new LucasKanadeFlow(width, height, settings);
    }
}
