package wayward.image;

/**
 * Shrinks an 8-bit gray picture by area averaging (each output pixel is the mean of the source area it
 * covers, with fractional weights at its edges). Separable: a horizontal pass into a float row buffer, then a
 * vertical pass. Tables and buffers are made once in the constructor; {@link #downscale} allocates nothing.
 * One instance per thread.
 */
public final class AreaDownscaler {
    private final int srcWidth;
    private final int srcHeight;
    private final int dstWidth;
    private final int dstHeight;
    private final int[] xFirst;
    private final int[] xCount;
    private final int[] xWeightStart;
    private final float[] xWeights;
    private final int[] yFirst;
    private final int[] yCount;
    private final int[] yWeightStart;
    private final float[] yWeights;
    /** Horizontally reduced rows: srcHeight rows of dstWidth. */
    private final float[] rows;
    private final float[] rowAccumulator;

    public AreaDownscaler(int srcWidth, int srcHeight, int dstWidth, int dstHeight) {
        if (srcWidth < 1 || srcHeight < 1) {
            throw new IllegalArgumentException("source size: " + srcWidth + "x" + srcHeight + " (expected at least 1x1)");
        }
        if (dstWidth < 1 || dstHeight < 1 || dstWidth > srcWidth || dstHeight > srcHeight) {
            throw new IllegalArgumentException("target size: " + dstWidth + "x" + dstHeight
                    + " (expected 1x1 up to the source size " + srcWidth + "x" + srcHeight + ")");
        }
        this.srcWidth = srcWidth;
        this.srcHeight = srcHeight;
        this.dstWidth = dstWidth;
        this.dstHeight = dstHeight;
        xFirst = new int[dstWidth];
        xCount = new int[dstWidth];
        xWeightStart = new int[dstWidth];
        xWeights = weights(srcWidth, dstWidth, xFirst, xCount, xWeightStart);
        yFirst = new int[dstHeight];
        yCount = new int[dstHeight];
        yWeightStart = new int[dstHeight];
        yWeights = weights(srcHeight, dstHeight, yFirst, yCount, yWeightStart);
        rows = new float[srcHeight * dstWidth];
        rowAccumulator = new float[dstWidth];
        // a whole-number ratio, the same both ways (640×360 → 320×180, 1280×720 → 320×180): k×k block means
        int k = srcWidth / dstWidth;
        factor = k > 1 && srcWidth == k * dstWidth && srcHeight == k * dstHeight ? k : 1;
        blockSums = new int[dstWidth];
    }

    /** k when the source is exactly k times the target both ways, else 1 (the general weighted path). */
    private final int factor;
    private final int[] blockSums;

    /** The k×k block means with integer sums, rounded half up. */
    private void blocks(byte[] src, int offset, int stride, byte[] out) {
        final int k = factor;
        final int area = k * k;
        final int half = area / 2;
        final int dw = dstWidth;
        final int[] sums = blockSums;
        for (int dy = 0; dy < dstHeight; dy++) {
            java.util.Arrays.fill(sums, 0);
            for (int j = 0; j < k; j++) {
                int p = offset + (dy * k + j) * stride;
                for (int dx = 0; dx < dw; dx++) {
                    int s = 0;
                    for (int i = 0; i < k; i++) {
                        s += src[p++] & 0xff;
                    }
                    sums[dx] += s;
                }
            }
            final int outRow = dy * dw;
            for (int dx = 0; dx < dw; dx++) {
                out[outRow + dx] = (byte) ((sums[dx] + half) / area);
            }
        }
    }

    /** Output height that keeps the aspect ratio for a given output width, rounded to an even number. */
    public static int heightFor(int srcWidth, int srcHeight, int dstWidth) {
        int h = (int) Math.round((double) srcHeight * dstWidth / srcWidth);
        h += h & 1;
        return Math.max(2, Math.min(h, srcHeight));
    }

    private static float[] weights(int src, int dst, int[] first, int[] count, int[] start) {
        double scale = (double) src / dst;
        float[] tmp = new float[dst * ((int) Math.ceil(scale) + 2)];
        int n = 0;
        for (int d = 0; d < dst; d++) {
            double a = d * scale;
            double b = (d + 1) * scale;
            int i0 = (int) Math.floor(a);
            int i1 = Math.min(src, (int) Math.ceil(b));
            first[d] = i0;
            count[d] = i1 - i0;
            start[d] = n;
            for (int i = i0; i < i1; i++) {
                double cover = Math.min(b, i + 1) - Math.max(a, i);
                tmp[n++] = (float) (cover / scale);
            }
        }
        return java.util.Arrays.copyOf(tmp, n);
    }

    /**
     * @param src    source luma, row-major, {@code srcStride} bytes per row; read only
     * @param offset index of the first source pixel
     * @param stride bytes per source row (at least the source width)
     * @param dst    receives the result; its size must be the target size
     */
    public void downscale(byte[] src, int offset, int stride, GrayFrame dst) {
        if (dst.width != dstWidth || dst.height != dstHeight) {
            throw new IllegalArgumentException("target frame: " + dst.width + "x" + dst.height
                    + " (expected " + dstWidth + "x" + dstHeight + ")");
        }
        if (stride < srcWidth || offset < 0 || src.length < offset + (long) stride * (srcHeight - 1) + srcWidth) {
            throw new IllegalArgumentException("source buffer: " + src.length + " bytes, stride " + stride
                    + " (expected " + srcWidth + "x" + srcHeight + " pixels)");
        }
        if (factor > 1) {
            blocks(src, offset, stride, dst.pixels);
            return;
        }
        final int dw = dstWidth;
        final float[] r = rows;
        for (int y = 0; y < srcHeight; y++) {
            final int srcRow = offset + y * stride;
            final int outRow = y * dw;
            for (int dx = 0; dx < dw; dx++) {
                final int first = srcRow + xFirst[dx];
                final int count = xCount[dx];
                final int w0 = xWeightStart[dx];
                float s = 0f;
                for (int k = 0; k < count; k++) {
                    s += (src[first + k] & 0xff) * xWeights[w0 + k];
                }
                r[outRow + dx] = s;
            }
        }
        final byte[] out = dst.pixels;
        final float[] acc = rowAccumulator;
        for (int dy = 0; dy < dstHeight; dy++) {
            final int count = yCount[dy];
            final int w0 = yWeightStart[dy];
            final int firstRow = yFirst[dy];
            java.util.Arrays.fill(acc, 0f);
            for (int k = 0; k < count; k++) {
                final float w = yWeights[w0 + k];
                final int inRow = (firstRow + k) * dw;
                for (int dx = 0; dx < dw; dx++) {
                    acc[dx] += r[inRow + dx] * w;
                }
            }
            final int outRow = dy * dw;
            for (int dx = 0; dx < dw; dx++) {
                int v = (int) (acc[dx] + 0.5f);
                out[outRow + dx] = (byte) (v > 255 ? 255 : v);
            }
        }
    }
}
