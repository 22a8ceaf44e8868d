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
