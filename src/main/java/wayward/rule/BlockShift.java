package wayward.rule;

/**
 * Finds how far a picture of 2×2-block means has shifted against a reference, in whole blocks, for
 * {@link TamperWatch}'s moved-camera check. Scratch sized once per resolution; nothing allocated per call.
 */
final class BlockShift {
    /** Scratch: the blocks and the reference with their means removed, and both halved. */
    private double[] centred;
    private double[] centredReference;
    private double[] coarse;
    private double[] coarseReference;
    private double best;
    private int bestX;
    private int bestY;
    private int width;
    private int height;
    /** The last shift found, blocks. */
    int x;
    int y;

    /** Sizes the scratch for pictures of bw × bh blocks (once per resolution). */
    void size(int bw, int bh) {
        width = bw;
        height = bh;
        centred = new double[bw * bh];
        centredReference = new double[bw * bh];
        coarse = new double[(bw / 2) * (bh / 2)];
        coarseReference = new double[coarse.length];
    }

    /**
     * The whole-block shift (±{@link #TamperWatch.SEARCH_BLOCKS}) minimising the mean absolute difference, means removed,
     * between the 2×2-block picture and the reference over their overlap; into {@link #x}, {@link #y}. Movers
     * cover a small part of the picture, so the best shift is the camera's. Searched coarse to fine (common
     * practice in block matching): every shift of half the range on 4×4 blocks, then the 3×3 shifts around
     * twice the coarse one on the 2×2 blocks; at most 49 + 10 trials instead of 169.
     */
    void find(double[] blocks, double[] reference) {
        int bw = width;
        int bh = height;
        double meanNow = 0;
        double meanRef = 0;
        for (int i = 0; i < blocks.length; i++) {
            meanNow += blocks[i];
            meanRef += reference[i];
        }
        meanNow /= blocks.length;
        meanRef /= blocks.length;
        final double[] now = centred;
        final double[] ref = centredReference;
        for (int i = 0; i < blocks.length; i++) {
            now[i] = blocks[i] - meanNow;
            ref[i] = reference[i] - meanRef;
        }
        int cw = bw / 2;
        int ch = bh / 2;
        halve(now, bw, coarse, cw, ch);
        halve(ref, bw, coarseReference, cw, ch);
        int range = TamperWatch.SEARCH_BLOCKS / 2;
        bestX = 0;
        bestY = 0;
        best = Double.MAX_VALUE;
        for (int dy = -range; dy <= range; dy++) {
            for (int dx = -range; dx <= range; dx++) {
                if (dx != 0 || dy != 0) {
                    consider(mad(coarse, coarseReference, cw, ch, dx, dy, 1), dx, dy);
                }
            }
        }
        keepStill(mad(coarse, coarseReference, cw, ch, 0, 0, 1));
        int cx = 2 * bestX;
        int cy = 2 * bestY;
        bestX = 0;
        bestY = 0;
        best = Double.MAX_VALUE;
        for (int dy = Math.max(-TamperWatch.SEARCH_BLOCKS, cy - 1); dy <= Math.min(TamperWatch.SEARCH_BLOCKS, cy + 1); dy++) {
            for (int dx = Math.max(-TamperWatch.SEARCH_BLOCKS, cx - 1); dx <= Math.min(TamperWatch.SEARCH_BLOCKS, cx + 1); dx++) {
                if (dx != 0 || dy != 0) {
                    consider(mad(now, ref, bw, bh, dx, dy, 2), dx, dy);
                }
            }
        }
        keepStill(mad(now, ref, bw, bh, 0, 0, 2));
        x = bestX;
        y = bestY;
    }

    /** Keeps the better of the trials of one level (shifts other than none). */
    private void consider(double mad, int dx, int dy) {
        if (mad < best) {
            best = mad;
            bestX = dx;
            bestY = dy;
        }
    }

    /** No shift wins unless the best trial beats it by more than 2 %: equal scores keep the camera where it was. */
    private void keepStill(double still) {
        if (still <= best * 1.02) {
            best = still;
            bestX = 0;
            bestY = 0;
        }
    }

    /** Mean absolute difference of a and b shifted by (dx, dy) over their overlap, every step-th sample. */
    private static double mad(double[] a, double[] b, int w, int h, int dx, int dy, int step) {
        double sum = 0;
        int n = 0;
        for (int y = Math.max(0, -dy); y < Math.min(h, h - dy); y += step) {
            int row = y * w;
            int refRow = (y + dy) * w;
            for (int x = Math.max(0, -dx); x < Math.min(w, w - dx); x += step) {
                sum += Math.abs(a[row + x] - b[refRow + x + dx]);
                n++;
            }
        }
        return n == 0 ? Double.MAX_VALUE : sum / n;
    }

    /** 2×2 means of a w-wide picture into out (cw × ch). */
    private static void halve(double[] in, int w, double[] out, int cw, int ch) {
        for (int y = 0; y < ch; y++) {
            int r0 = 2 * y * w;
            int r1 = r0 + w;
            for (int x = 0; x < cw; x++) {
                out[y * cw + x] = 0.25 * (in[r0 + 2 * x] + in[r0 + 2 * x + 1] + in[r1 + 2 * x] + in[r1 + 2 * x + 1]);
            }
        }
    }
}
