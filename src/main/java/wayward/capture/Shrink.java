package wayward.capture;

import static org.bytedeco.ffmpeg.global.avutil.AV_PIX_FMT_GRAY8;
import static org.bytedeco.ffmpeg.global.swscale.SWS_AREA;
import static org.bytedeco.ffmpeg.global.swscale.sws_freeContext;
import static org.bytedeco.ffmpeg.global.swscale.sws_getCachedContext;
import static org.bytedeco.ffmpeg.global.swscale.sws_scale;

import org.bytedeco.ffmpeg.avutil.AVFrame;
import org.bytedeco.ffmpeg.global.avutil;
import org.bytedeco.ffmpeg.swscale.SwsContext;
import org.bytedeco.javacpp.BytePointer;
import org.bytedeco.javacpp.DoublePointer;
import org.bytedeco.javacpp.IntPointer;
import org.bytedeco.javacpp.PointerPointer;
import wayward.image.GrayFrame;

/**
 * The shrink of a decoded picture to analysis size: swscale's area filter, natively, straight to 8-bit gray; for
 * formats whose plane 0 is luma that plane is read as a gray picture (no chroma is touched), others are
 * converted. The output size is fixed by the first picture (the analysis width, the aspect kept, even). One per
 * source, capture thread only; {@link #endPass} frees the scaler at the end of each pass.
 */
final class Shrink {
    private final int analysisWidth;
    private int outWidth;
    private int outHeight;
    private SwsContext sws;
    private BytePointer grayNative;
    private PointerPointer<BytePointer> grayPlanes;
    private IntPointer grayStrides;

    Shrink(int analysisWidth) {
        this.analysisWidth = analysisWidth;
    }

    /**
     * Shrinks a decoded picture into the slot's writable frame (not published).
     *
     * @param planes  the picture's plane pointers (a view of {@code f.data()})
     * @param strides its line sizes (a view of {@code f.linesize()})
     */
    GrayFrame into(AVFrame f, PointerPointer<?> planes, IntPointer strides, FrameSlot slot) {
        int w = f.width();
        int h = f.height();
        if (outWidth == 0) {
            outWidth = Math.min(analysisWidth, w);
            outHeight = heightFor(w, h, outWidth);
        }
        int ow = Math.min(outWidth, w);
        int oh = Math.min(outHeight, h);
        int format = isPlanarLuma(f.format()) ? AV_PIX_FMT_GRAY8 : f.format();
        // (on failure the old context is freed and null returned: the field must follow at once)
        sws = sws_getCachedContext(sws, w, h, format, ow, oh, AV_PIX_FMT_GRAY8, SWS_AREA,
                null, null, (DoublePointer) null);
        if (sws == null) {
            BytePointer name = avutil.av_get_pix_fmt_name(f.format());
            throw new IllegalStateException("cannot convert pixel format " + (name == null ? "#" + f.format()
                    : name.getString()) + " (" + w + "x" + h + ") to gray");
        }
        int stride = (ow + 31) & ~31;
        ensureGrayNative(stride, oh);
        sws_scale(sws, planes, strides, 0, h, grayPlanes, grayStrides);
        GrayFrame out = slot.writable(ow, oh);
        if (stride == ow) {
            grayNative.position(0).get(out.pixels, 0, ow * oh);
        } else {
            for (int y = 0; y < oh; y++) {
                grayNative.position((long) y * stride).get(out.pixels, y * ow, ow);
            }
            grayNative.position(0);
        }
        return out;
    }

    /** Frees the scaler (a new pass may bring another size or format). */
    void endPass() {
        if (sws != null) {
            sws_freeContext(sws);
            sws = null;
        }
    }

    private void ensureGrayNative(int stride, int h) {
        long need = (long) stride * h;
        if (grayNative == null || grayNative.capacity() < need || grayStrides.get(0) != stride) {
            grayNative = new BytePointer(need);
            grayPlanes = new PointerPointer<>(grayNative, null, null, null);
            grayStrides = new IntPointer(stride, 0, 0, 0);
        }
    }

    /** Output height that keeps the aspect ratio for a given output width, rounded to an even number. */
    static int heightFor(int srcWidth, int srcHeight, int dstWidth) {
        int h = (int) Math.round((double) srcHeight * dstWidth / srcWidth);
        h += h & 1;
        return Math.max(2, Math.min(h, srcHeight));
    }

    /** Pixel formats whose plane 0 is 8-bit luma: the gray picture as it is. */
    private static boolean isPlanarLuma(int format) {
        return format == avutil.AV_PIX_FMT_YUV420P
                || format == avutil.AV_PIX_FMT_YUVJ420P
                || format == avutil.AV_PIX_FMT_YUV422P
                || format == avutil.AV_PIX_FMT_YUVJ422P
                || format == avutil.AV_PIX_FMT_YUV444P
                || format == avutil.AV_PIX_FMT_YUVJ444P
                || format == avutil.AV_PIX_FMT_YUV440P
                || format == avutil.AV_PIX_FMT_YUVJ440P
                || format == avutil.AV_PIX_FMT_YUV411P
                || format == avutil.AV_PIX_FMT_YUV410P
                || format == avutil.AV_PIX_FMT_NV12
                || format == avutil.AV_PIX_FMT_NV21
                || format == AV_PIX_FMT_GRAY8;
    }
}
