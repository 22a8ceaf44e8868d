package wayward.flow;

/**
 * The inner loops of {@link GridLucasKanadeFlow} that run on vector instructions where the JVM has them: the fill's
 * run of inner grid points, its neighbour weights and starting support, the sums of a full-size window's plain
 * solve step, and that step's solve for a whole grid row. Every variant gives the same bits; they differ only in
 * speed.
 */
interface FlowKernel {
    /**
     * Floats a {@link #windowSums} call needs in its {@code sums} array: the 10 sums, then the variant's scratch
     * (ten vectors of up to 64 float lanes, the widest vector shape there is: 2048 bits).
     */
    int SUMS_LENGTH = 10 + 10 * 64;

    /**
     * Fills inner points from {@code from} on, up to {@code to} (exclusive), of the pass's level, as
     * {@code GridLucasKanadeFlow.fillRows} does point by point, and returns the first point it left to the caller
     * (who fills it and the rest one by one). A point in the run's first or last grid column is not inner: its
     * result is filled again by the caller.
     */
    int fillInside(FillPass pass, int from, int to);

    /**
     * The sums of a plain solve step over the {@code side} × {@code side} window whose top-left pixel is
     * {@code corner} in {@code i0}, against {@code i1} sampled bilinearly ({@code w00 … w11}) at
     * {@code shift} pixels from each window pixel, into {@code sums[0..9]}: Σt, Σix, Σiy, Σix², Σix·iy, Σiy², Σd,
     * Σix·d, Σd², Σiy·d, with ix and iy the central differences (not halved) and d the bilinear value less t.
     * Summed column by column (each column down its rows, then the columns left to right), the order in which
     * vector lanes add them. The window and its one-pixel frame must lie inside both pictures.
     */
    void windowSums(float[] i0, float[] i1, int w, int corner, int shift, int side, float w00, float w01, float w10,
            float w11, float[] sums);

    /**
     * The fill's brightness weights of a {@code gw} × {@code gh} grid whose window means are {@code mean}, as
     * {@code GridLucasKanadeFlow.fillWeights} works them out, into {@code near} (neighbour n of point k at
     * {@code n × stride + k}); it may also write the slots of pairs that wrap round from one grid row to the next,
     * which nobody reads. Returns false where it left the work to the caller.
     */
    boolean fillWeights(float[] mean, int gw, int gh, float[] near, int stride);

    /**
     * The fill's starting support of points 0, 1, … of a level, as {@code GridLucasKanadeFlow.initSupport} works it
     * out: the tensor ({@code ta, tb, tc}) weakened by the residual {@code res} into {@code sa, sb, sc}, and 1 or 0
     * into {@code kept} by whether the point keeps its motion (its confidence {@code conf}). Returns the first point
     * it left to the caller.
     */
    int support(float[] ta, float[] tb, float[] tc, float[] res, float[] conf, float[] sa, float[] sb, float[] sc,
            float[] kept);

    /**
     * The plain single step of the row's points 0 … {@code count − 1} from their sums and starts, as
     * {@code GridLucasKanadeFlow.solvePoint} works it out for a full-size window with one step.
     */
    void steps(StepRow row, int count);

    /** Plain Java: every point and pixel one by one. */
    FlowKernel SCALAR = new FlowKernel() {
        @Override
        public int fillInside(FillPass pass, int from, int to) {
            return from;
        }

        @Override
        public boolean fillWeights(float[] mean, int gw, int gh, float[] near, int stride) {
            return false;
        }

        @Override
        public int support(float[] ta, float[] tb, float[] tc, float[] res, float[] conf, float[] sa, float[] sb,
                float[] sc, float[] kept) {
            return 0;
        }

        @Override
        public void windowSums(float[] i0, float[] i1, int w, int corner, int shift, int side, float w00, float w01,
                float w10, float w11, float[] sums) {
            scalarWindowSums(i0, i1, w, corner, shift, side, w00, w01, w10, w11, sums);
        }

        @Override
        public void steps(StepRow row, int count) {
            scalarSteps(row, 0, count);
        }
    };

    /**
     * {@link #steps} of points {@code from} … {@code to − 1} one by one: the same operations, in the same order, as
     * {@code GridLucasKanadeFlow.solvePoint}'s epilogue (the gradients' factor 1/2 applied to the sums, the
     * brightness offset eliminated, the regularised 2 × 2 system solved once).
     */
    static void scalarSteps(StepRow row, int from, int to) {
        final float[] sums = row.sums;
        final int s = row.stride;
        final float sw = row.pixels;
        final float invN = 1f / sw;
        // as the solve works it out, λ × the weights' sum / the window's pixels (the same two here, but the product
        // and quotient round as they do there)
        final float lam = row.lambda * sw / sw;
        for (int i = from; i < to; i++) {
            final float st = sums[i];
            final float sx = 0.5f * sums[s + i];
            final float sy = 0.5f * sums[2 * s + i];
            final float sxx = 0.25f * sums[3 * s + i];
            final float sxy = 0.25f * sums[4 * s + i];
            final float syy = 0.25f * sums[5 * s + i];
            final float sd = sums[6 * s + i];
            final float sxd = 0.5f * sums[7 * s + i];
            final float sdd = sums[8 * s + i];
            final float syd = 0.5f * sums[9 * s + i];
            final float cxx = sxx - sx * sx * invN;
            final float cxy = sxy - sx * sy * invN;
            final float cyy = syy - sy * sy * invN;
            final float half = 0.5f * (cxx - cyy) * invN;
            final float e = 0.5f * (cxx + cyy) * invN - (float) Math.sqrt(half * half + cxy * cxy * invN * invN);
            final int g = row.first + i;
            row.confidence[g] = e > 0f ? e : 0f;
            row.a[g] = cxx * invN;
            row.b[g] = cxy * invN;
            row.c[g] = cyy * invN;
            row.mean[g] = st * invN;
            row.windowMean[g] = st / sw;
            final float a = cxx + lam;
            final float c = cyy + lam;
            final float det = a * c - cxy * cxy;
            float u = row.u0[i];
            float v = row.v0[i];
            float residual = GridLucasKanadeFlow.UNKNOWN_RESIDUAL;
            if (det > 1e-3f) {
                final float ia = c / det;
                final float ib = -cxy / det;
                final float ic = a / det;
                final float bx = sxd - sx * sd * invN;
                final float by = syd - sy * sd * invN;
                final float du = -(ia * bx + ib * by);
                final float dv = -(ib * bx + ic * by);
                u += du;
                v += dv;
                final float left = sdd - sd * sd * invN + bx * du + by * dv;
                residual = (left > 0f ? left : 0f) * invN;
            }
            row.u[g] = u;
            row.v[g] = v;
            row.residual[g] = residual;
        }
    }

    /** {@link #windowSums} one pixel at a time, in the order the interface gives. */
    static void scalarWindowSums(float[] i0, float[] i1, int w, int corner, int shift, int side, float w00,
            float w01, float w10, float w11, float[] sums) {
        java.util.Arrays.fill(sums, 0, 10, 0f);
        for (int c = 0; c < side; c++) {
            float st = 0f;
            float sx = 0f;
            float sy = 0f;
            float sxx = 0f;
            float sxy = 0f;
            float syy = 0f;
            float sd = 0f;
            float sxd = 0f;
            float sdd = 0f;
            float syd = 0f;
            for (int r = 0, p = corner + c; r < side; r++, p += w) {
                final float ix = i0[p + 1] - i0[p - 1];
                final float iy = i0[p + w] - i0[p - w];
                final float tv = i0[p];
                final int q = p + shift;
                final float d = w00 * i1[q] + w01 * i1[q + 1] + w10 * i1[q + w] + w11 * i1[q + w + 1] - tv;
                st += tv;
                sx += ix;
                sy += iy;
                sxx += ix * ix;
                sxy += ix * iy;
                syy += iy * iy;
                sd += d;
                sxd += ix * d;
                sdd += d * d;
                syd += iy * d;
            }
            sums[0] += st;
            sums[1] += sx;
            sums[2] += sy;
            sums[3] += sxx;
            sums[4] += sxy;
            sums[5] += syy;
            sums[6] += sd;
            sums[7] += sxd;
            sums[8] += sdd;
            sums[9] += syd;
        }
    }

    /**
     * The vector variant ({@link VectorKernel}) when this JVM has the {@code jdk.incubator.vector} module (java
     * {@code --add-modules jdk.incubator.vector}), else {@link #SCALAR}.
     */
    static FlowKernel best() {
        return vectorLanes() > 0 ? new VectorKernel() : SCALAR;
    }

    /** Float lanes of {@link VectorKernel} in this JVM, 0 where it cannot run. */
    static int vectorLanes() {
        // asked of the module layer, not of the class: VectorKernel must not even be loaded without the module
        return ModuleLayer.boot().findModule("jdk.incubator.vector").isPresent() ? VectorKernel.lanes() : 0;
    }
}
