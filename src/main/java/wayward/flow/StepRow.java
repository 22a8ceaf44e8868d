package wayward.flow;

/**
 * One grid row of {@link GridLucasKanadeFlow}'s plain single steps on the full-size level (the default finest
 * solve): each point's window sums and starting motion in, its motion, tensor, confidence and residual out. Filled
 * by the band that solves the row, then read by {@link FlowKernel#steps} for the whole row at once.
 */
final class StepRow {
    /** Sum s of the row's point i ({@link FlowKernel#windowSums}'s order, s = 0 … 9) at {@code s × stride + i}. */
    final float[] sums;
    /** The row's points, the most a row has. */
    final int stride;
    /** Each point's starting motion. */
    final float[] u0;
    final float[] v0;
    /** Grid index of the row's first point in the output arrays. */
    int first;
    /** The window's pixels as a float, and the regulariser per window (the solve's {@code lambda}). */
    float pixels;
    float lambda;
    float[] u;
    float[] v;
    float[] confidence;
    /** The window's mean-free structure tensor per pixel. */
    float[] a;
    float[] b;
    float[] c;
    /** The window's mean brightness, as the solve writes it twice: the level's (Σt × 1/n), the full-size (Σt ÷ n). */
    float[] mean;
    float[] windowMean;
    float[] residual;

    StepRow(int points) {
        stride = points;
        sums = new float[10 * points];
        u0 = new float[points];
        v0 = new float[points];
    }
}
