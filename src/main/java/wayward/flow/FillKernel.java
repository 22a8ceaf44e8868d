package wayward.flow;

/**
 * How {@link GridLucasKanadeFlow}'s fill treats a run of inner grid points (points whose eight neighbours all lie in
 * the grid). Every variant gives the same bits as the fill's point-by-point code ({@code fillPoint}); they differ
 * only in speed.
 */
interface FillKernel {
    /**
     * Fills inner points from {@code from} on, up to {@code to} (exclusive), of the pass's level, and returns the
     * first point it left to the caller (who fills it and the rest one by one). A point in the run's first or last
     * grid column is not inner: its result is filled again by the caller.
     */
    int inside(FillPass pass, int from, int to);

    /** The variant that leaves every point to the caller. */
    FillKernel POINTS = (pass, from, to) -> from;

    /**
     * The vector variant ({@link VectorFill}) when this JVM has the {@code jdk.incubator.vector} module (java
     * {@code --add-modules jdk.incubator.vector}), else {@link #POINTS}.
     */
    static FillKernel best() {
        return vectorLanes() > 0 ? new VectorFill() : POINTS;
    }

    /** Float lanes of {@link VectorFill} in this JVM, 0 where it cannot run. */
    static int vectorLanes() {
        // asked of the module layer, not of the class: VectorFill must not even be loaded without the module
        return ModuleLayer.boot().findModule("jdk.incubator.vector").isPresent() ? VectorFill.lanes() : 0;
    }
}
