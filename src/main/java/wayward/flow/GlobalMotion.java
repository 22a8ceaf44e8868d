package wayward.flow;

/**
 * The dominant motion of a whole field: the median of u and of v over the samples whose confidence reaches a
 * floor. A shaking or slowly panning camera moves everything by about the same amount, and the median ignores
 * the minority that moves on its own (common practice: a robust location estimate). It is only trusted when
 * confident samples cover at least {@link #MIN_CONFIDENT_SHARE} of the picture: on flat ground the few
 * textured samples may all belong to one mover, whose motion is not the camera's. Allocation-free; one
 * instance per estimator.
 */
final class GlobalMotion {
    /** Samples below this confidence, (grey levels per pixel)², do not vote: flat ground and noise. */
    static final float CONFIDENCE_FLOOR = 4f;

    /** Share of all samples that must be confident before the median counts as the camera's motion. */
    static final float MIN_CONFIDENT_SHARE = 0.4f;

    private final float[] scratch;

    GlobalMotion(int samples) {
        scratch = new float[samples];
    }

    /**
     * Writes {@code field.globalU} and {@code field.globalV} (0 when too few samples vote).
     *
     * @return true when enough samples voted for the median to be the camera's motion
     */
    boolean measure(FlowField field) {
        int n = 0;
        for (int i = 0; i < field.confidence.length; i++) {
            if (field.confidence[i] >= CONFIDENCE_FLOOR) {
                scratch[n++] = field.u[i];
            }
        }
        if (n < 8 || n < MIN_CONFIDENT_SHARE * field.confidence.length) {
            field.globalU = 0f;
            field.globalV = 0f;
            return false;
        }
        field.globalU = median(scratch, n);
        n = 0;
        for (int i = 0; i < field.confidence.length; i++) {
            if (field.confidence[i] >= CONFIDENCE_FLOOR) {
                scratch[n++] = field.v[i];
            }
        }
        field.globalV = median(scratch, n);
        return true;
    }

    /** Median of a[0..n) by quickselect; reorders a. */
    static float median(float[] a, int n) {
        return Quickselect.kth(a, n, n / 2);
    }
}
