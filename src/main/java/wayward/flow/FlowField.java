package wayward.flow;

/**
 * A flow field: at each sample point the displacement from the earlier to the later frame, in pixels of the
 * analysed picture per frame pair, and a confidence. The samples lie on a regular grid over the picture: sample
 * (i, j) sits at pixel ({@link #pixelX}(i), {@link #pixelY}(j)); with {@code stride} 1 there is one sample per
 * pixel. Row-major arrays of width × height samples, owned by this field and overwritten by every estimate.
 */
public final class FlowField {
    /** Samples per row and rows of samples. */
    public final int width;
    public final int height;
    /** Size of the analysed picture, pixels. */
    public final int imageWidth;
    public final int imageHeight;
    /** Pixels between neighbouring samples; the first sample is at pixel {@code stride / 2}. */
    public final int stride;
    /** Horizontal displacement, pixels (positive = right). */
    public final float[] u;
    /** Vertical displacement, pixels (positive = down, image rows). */
    public final float[] v;
    /**
     * Smallest eigenvalue of the window's mean structure tensor (Shi &amp; Tomasi 1994), in
     * (grey levels per pixel)²: near 0 on flat areas and on straight edges, where the flow is not defined.
     */
    public final float[] confidence;
    /**
     * Largest eigenvalue of the same tensor, (grey levels per pixel)²: large on any edge or texture. A sample
     * whose {@link #confidence} is low but whose {@code edge} is high lies on a straight edge: there the flow's
     * component across the edge (along {@link #normalX}, {@link #normalY}) is measured, the component along the
     * edge is not (the aperture problem).
     */
    public final float[] edge;
    /**
     * Unit vector of the window's strongest gradient direction (the edge normal), sign arbitrary; (0, 0) where
     * the window has no gradient.
     */
    public final float[] normalX;
    public final float[] normalY;
    /**
     * Dominant motion of the whole picture (median over confident samples), pixels per frame pair: the camera's
     * own shake or drift. Written with every estimate.
     */
    public float globalU;
    public float globalV;

    /** A field with one sample per pixel. */
    public FlowField(int width, int height) {
        this(width, height, 1);
    }

    /** A field sampled every {@code stride} pixels over a picture of the given size. */
    public FlowField(int imageWidth, int imageHeight, int stride) {
        if (imageWidth < 1 || imageHeight < 1) {
            throw new IllegalArgumentException("size: " + imageWidth + "x" + imageHeight + " (expected at least 1x1)");
        }
        if (stride < 1) {
            throw new IllegalArgumentException("stride: " + stride + " (expected 1 or more)");
        }
        this.imageWidth = imageWidth;
        this.imageHeight = imageHeight;
        this.stride = stride;
        this.width = samples(imageWidth, stride);
        this.height = samples(imageHeight, stride);
        this.u = new float[width * height];
        this.v = new float[width * height];
        this.confidence = new float[width * height];
        this.edge = new float[width * height];
        this.normalX = new float[width * height];
        this.normalY = new float[width * height];
    }

    /** Copies every sample and the dominant motion of a field of the same layout; allocates nothing. */
    public void copyFrom(FlowField o) {
        if (o.imageWidth != imageWidth || o.imageHeight != imageHeight || o.stride != stride) {
            throw new IllegalArgumentException("field: " + o.imageWidth + "x" + o.imageHeight + " every " + o.stride
                    + " px (expected " + imageWidth + "x" + imageHeight + " every " + stride + " px)");
        }
        System.arraycopy(o.u, 0, u, 0, u.length);
        System.arraycopy(o.v, 0, v, 0, v.length);
        System.arraycopy(o.confidence, 0, confidence, 0, confidence.length);
        System.arraycopy(o.edge, 0, edge, 0, edge.length);
        System.arraycopy(o.normalX, 0, normalX, 0, normalX.length);
        System.arraycopy(o.normalY, 0, normalY, 0, normalY.length);
        globalU = o.globalU;
        globalV = o.globalV;
    }

    /**
     * Writes the eigen-analysis of a window's mean structure tensor [[a, b], [b, c]] into sample {@code i}:
     * {@link #confidence} (smallest eigenvalue), {@link #edge} (largest) and the unit normal of the largest.
     */
    public void setTensor(int i, float a, float b, float c) {
        final float half = 0.5f * (a - c);
        final float mean = 0.5f * (a + c);
        final float root = (float) Math.sqrt(half * half + b * b);
        final float small = mean - root;
        confidence[i] = small > 0f ? small : 0f;
        edge[i] = mean + root > 0f ? mean + root : 0f;
        // eigenvector of the largest eigenvalue: (half + root, b) or (b, root - half), whichever is longer
        float nx;
        float ny;
        if (half >= 0f) {
            nx = half + root;
            ny = b;
        } else {
            nx = b;
            ny = root - half;
        }
        final float len2 = nx * nx + ny * ny;
        if (len2 > 1e-20f) {
            final float inv = (float) (1.0 / Math.sqrt(len2));
            normalX[i] = nx * inv;
            normalY[i] = ny * inv;
        } else {
            normalX[i] = 0f;
            normalY[i] = 0f;
        }
    }

    /** Samples along a side of {@code size} pixels: positions stride/2, stride/2 + stride, ... up to size − 1. */
    public static int samples(int size, int stride) {
        int offset = stride / 2;
        return size - 1 >= offset ? (size - 1 - offset) / stride + 1 : 1;
    }

    /** Pixel column of sample column i. */
    public int pixelX(int i) {
        return Math.min(imageWidth - 1, stride / 2 + i * stride);
    }

    /** Pixel row of sample row j. */
    public int pixelY(int j) {
        return Math.min(imageHeight - 1, stride / 2 + j * stride);
    }

    /**
     * The field at every pixel, by bilinear interpolation between samples (for pictures and files, not the
     * analysis loop: allocates a new field).
     */
    public FlowField toDense() {
        if (stride == 1) {
            return this;
        }
        FlowField d = new FlowField(imageWidth, imageHeight);
        for (int y = 0; y < imageHeight; y++) {
            float gy = clampTo((float) (y - stride / 2) / stride, height - 1);
            int j0 = Math.min((int) gy, Math.max(0, height - 2));
            int j1 = Math.min(j0 + 1, height - 1);
            float wy = gy - j0;
            for (int x = 0; x < imageWidth; x++) {
                float gx = clampTo((float) (x - stride / 2) / stride, width - 1);
                int i0 = Math.min((int) gx, Math.max(0, width - 2));
                int i1 = Math.min(i0 + 1, width - 1);
                float wx = gx - i0;
                int o = y * imageWidth + x;
                d.u[o] = lerp2(u, j0, j1, i0, i1, wx, wy);
                d.v[o] = lerp2(v, j0, j1, i0, i1, wx, wy);
                d.confidence[o] = lerp2(confidence, j0, j1, i0, i1, wx, wy);
                d.edge[o] = lerp2(edge, j0, j1, i0, i1, wx, wy);
                // the nearest sample's normal (normals do not interpolate)
                int near = (wy < 0.5f ? j0 : j1) * width + (wx < 0.5f ? i0 : i1);
                d.normalX[o] = normalX[near];
                d.normalY[o] = normalY[near];
            }
        }
        return d;
    }

    private static float clampTo(float g, int max) {
        return g < 0 ? 0 : Math.min(g, max);
    }

    private float lerp2(float[] a, int j0, int j1, int i0, int i1, float wx, float wy) {
        float top = a[j0 * width + i0] + wx * (a[j0 * width + i1] - a[j0 * width + i0]);
        float bottom = a[j1 * width + i0] + wx * (a[j1 * width + i1] - a[j1 * width + i0]);
        return top + wy * (bottom - top);
    }
}
