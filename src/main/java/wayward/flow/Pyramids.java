package wayward.flow;

/** Image pyramids by 2×2 area means; shared by the estimators. Allocation-free. */
final class Pyramids {
    private Pyramids() {
    }

    /**
     * Fills {@code pyramid[0]} with the frame as floats and each further level with the 2×2 mean of the one
     * before; level sizes are floor(previous / 2), so every source pixel read is in range.
     */
    static void build(byte[] frame, float[][] pyramid, int[] widths, int[] heights) {
        final float[] base = pyramid[0];
        for (int i = 0; i < base.length; i++) {
            base[i] = frame[i] & 0xff;
        }
        for (int l = 1; l < pyramid.length; l++) {
            halve(pyramid[l - 1], widths[l - 1], pyramid[l], widths[l], heights[l]);
        }
    }

    /**
     * Like {@link #build}, but each level is low-passed before it is halved: the 2×2 mean widened by a
     * [1 2 1]/4 binomial, i.e. [1 3 3 1]/8 per axis around the coarse pixel's centre, so fine texture does not
     * alias into false structure on the coarse levels (common practice: Burt &amp; Adelson 1983).
     * {@code scratch} holds at least (level-0 height) × (level-1 width) floats.
     */
    static void buildSmooth(byte[] frame, float[][] pyramid, int[] widths, int[] heights, float[] scratch) {
        if (pyramid.length == 1) {
            convertRows(frame, pyramid[0], widths[0], 0, heights[0]);
            return;
        }
        convertSmoothRows(frame, pyramid[0], widths[0], scratch, widths[1], 0, heights[0]);
        smoothColumns(scratch, heights[0], pyramid[1], widths[1], 0, heights[1]);
        for (int l = 2; l < pyramid.length; l++) {
            halveSmooth(pyramid[l - 1], widths[l - 1], heights[l - 1], pyramid[l], widths[l], heights[l], scratch);
        }
    }

    /**
     * {@link #convertRows} and {@link #smoothRows} of level 0 in one pass over the frame's rows [y0, y1). The row
     * filter sums whole grey levels, exactly in integers as in floats (at most 8 × 255), so the result is the same
     * bit for bit as converting first and filtering the floats.
     */
    static void convertSmoothRows(byte[] frame, float[] base, int fw, float[] tmp, int w, int y0, int y1) {
        final int lastX = fw - 1;
        // coarse columns whose four taps lie inside the row: 2x − 1 ≥ 0 and 2x + 2 ≤ lastX
        final int inner = Math.max(1, Math.min(w, (lastX - 2) / 2 + 1));
        for (int y = y0; y < y1; y++) {
            final int row = y * fw;
            for (int i = row; i < row + fw; i++) {
                base[i] = frame[i] & 0xff;
            }
            final int out = y * w;
            smoothColumnAt(base, row, lastX, tmp, out, 0);
            for (int x = 1; x < inner; x++) {
                final int c = row + 2 * x;
                final int sum = (frame[c - 1] & 0xff) + 3 * ((frame[c] & 0xff) + (frame[c + 1] & 0xff))
                        + (frame[c + 2] & 0xff);
                tmp[out + x] = 0.125f * sum;
            }
            for (int x = inner; x < w; x++) {
                smoothColumnAt(base, row, lastX, tmp, out, x);
            }
        }
    }

    static void halveSmooth(float[] fine, int fw, int fh, float[] coarse, int w, int h, float[] tmp) {
        smoothRows(fine, fw, tmp, w, 0, fh);
        smoothColumns(tmp, fh, coarse, w, 0, h);
    }

    /** Level 0 rows [y0, y1) from the frame's bytes. */
    static void convertRows(byte[] frame, float[] base, int w, int y0, int y1) {
        for (int i = y0 * w; i < y1 * w; i++) {
            base[i] = frame[i] & 0xff;
        }
    }

    /** Horizontal half of {@link #halveSmooth} for fine rows [y0, y1): [1 3 3 1]/8 around each coarse column. */
    static void smoothRows(float[] fine, int fw, float[] tmp, int w, int y0, int y1) {
        final int lastX = fw - 1;
        // coarse columns whose four taps lie inside the row (no clamps): 2x − 1 ≥ 0 and 2x + 2 ≤ lastX
        final int inner = Math.max(1, Math.min(w, (lastX - 2) / 2 + 1));
        for (int y = y0; y < y1; y++) {
            final int row = y * fw;
            final int out = y * w;
            smoothColumnAt(fine, row, lastX, tmp, out, 0);
            for (int x = 1; x < inner; x++) {
                final int c = row + 2 * x;
                tmp[out + x] = 0.125f * (fine[c - 1] + 3f * (fine[c] + fine[c + 1]) + fine[c + 2]);
            }
            for (int x = inner; x < w; x++) {
                smoothColumnAt(fine, row, lastX, tmp, out, x);
            }
        }
    }

    /** One coarse column x of {@link #smoothRows}, its taps clamped to the row. */
    private static void smoothColumnAt(float[] fine, int row, int lastX, float[] tmp, int out, int x) {
        final int c = 2 * x;
        final int a = c > 0 ? c - 1 : 0;
        final int d = c + 2 <= lastX ? c + 2 : lastX;
        tmp[out + x] = 0.125f * (fine[row + a] + 3f * (fine[row + c] + fine[row + c + 1]) + fine[row + d]);
    }

    /** Vertical half of {@link #halveSmooth} for coarse rows [y0, y1). */
    static void smoothColumns(float[] tmp, int fh, float[] coarse, int w, int y0, int y1) {
        final int lastY = fh - 1;
        for (int y = y0; y < y1; y++) {
            final int c = 2 * y;
            final int ra = (c > 0 ? c - 1 : 0) * w;
            final int rb = c * w;
            final int rc = (c + 1) * w;
            final int rd = (c + 2 <= lastY ? c + 2 : lastY) * w;
            final int out = y * w;
            for (int x = 0; x < w; x++) {
                coarse[out + x] = 0.125f * (tmp[ra + x] + 3f * (tmp[rb + x] + tmp[rc + x]) + tmp[rd + x]);
            }
        }
    }

    static void halve(float[] fine, int fineWidth, float[] coarse, int w, int h) {
        for (int y = 0; y < h; y++) {
            final int r0 = 2 * y * fineWidth;
            final int r1 = r0 + fineWidth;
            final int out = y * w;
            for (int x = 0; x < w; x++) {
                final int c = 2 * x;
                coarse[out + x] = 0.25f * (fine[r0 + c] + fine[r0 + c + 1] + fine[r1 + c] + fine[r1 + c + 1]);
            }
        }
    }
}
