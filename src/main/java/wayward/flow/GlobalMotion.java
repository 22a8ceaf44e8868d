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
    private final float[] scratchV;
    private final float[] inside;
    private final float[] sample = new float[Quickselect.SAMPLE];

    GlobalMotion(int samples) {
        scratch = new float[samples];
        scratchV = new float[samples];
        inside = new float[samples];
    }

    /**
     * Writes {@code field.globalU} and {@code field.globalV} (0 when too few samples vote).
     *
     * @return true when enough samples voted for the median to be the camera's motion
     */
    boolean measure(FlowField field) {
        return measure(field, 1f);
    }

    /**
     * As {@link #measure(FlowField)}, with the confidence floor {@code level} times {@link #CONFIDENCE_FLOOR}: in
     * sensor noise above the level the floor was chosen at, noise alone reaches it.
     */
    boolean measure(FlowField field, float level) {
        final float floor = CONFIDENCE_FLOOR * level;
        // one pass without branching on the confidence (its pattern is noise to the branch predictor): every
        // sample is copied, and the count moves on past the confident ones only
        final float[] c = field.confidence;
        final float[] u = field.u;
        final float[] v = field.v;
        final float[] su = scratch;
        final float[] sv = scratchV;
        int n = 0;
        for (int i = 0; i < c.length; i++) {
            su[n] = u[i];
            sv[n] = v[i];
            n += c[i] >= floor ? 1 : 0;
        }
        if (n < 8 || n < MIN_CONFIDENT_SHARE * c.length) {
            field.globalU = 0f;
            field.globalV = 0f;
            return false;
        }
        field.globalU = Quickselect.kth(su, n, n / 2, inside, sample);
        field.globalV = Quickselect.kth(sv, n, n / 2, inside, sample);
        return true;
    }
}
