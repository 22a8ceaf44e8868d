package wayward.capture;

import static org.bytedeco.ffmpeg.global.avcodec.AV_PKT_FLAG_KEY;
import static org.bytedeco.ffmpeg.global.avcodec.av_packet_unref;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_receive_frame;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_send_packet;
import static org.bytedeco.ffmpeg.global.avutil.AV_LOG_ERROR;
import static org.bytedeco.ffmpeg.global.avutil.AV_NOPTS_VALUE;
import static org.bytedeco.ffmpeg.global.avutil.av_frame_alloc;
import static org.bytedeco.ffmpeg.global.avutil.av_frame_free;
import static org.bytedeco.ffmpeg.global.avutil.av_log_set_level;

import org.bytedeco.ffmpeg.avcodec.AVCodecContext;
import org.bytedeco.ffmpeg.avcodec.AVPacket;
import org.bytedeco.ffmpeg.avutil.AVFrame;
import org.bytedeco.javacpp.IntPointer;
import org.bytedeco.javacpp.PointerPointer;
import org.bytedeco.javacv.FFmpegFrameGrabber;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.image.GrayFrame;
import wayward.retry.Backoff;
import wayward.secret.Urls;

/**
 * Reads one camera: demuxes with JavaCV's {@link FFmpegFrameGrabber#grabPacket()} (the only reader of the
 * stream), decodes with a decoder of its own, shrinks the picture's luma plane straight to analysis size with
 * swscale's area filter and publishes it to a {@link FrameSlot}. Frames are timed by the stream's timestamps
 * (seconds since the first frame, continued across loops and reconnects). URL sources reconnect with
 * exponential backoff and jitter, forever, until stopped.
 *
 * <p>Runs on the camera's capture thread ({@link #run()}); {@link #stop()} may be called from any thread. The
 * capture thread never waits for analysis (except in lossless replay), the network or the disk.
 */
public final class VideoSource implements Runnable {
    /**
     * Told when a network source stops delivering frames and when it delivers again; called on the capture
     * thread, so it must not block.
     */
    public interface Health {
        /** Frames stopped: the stream ended, failed or stalled. {@code streamSeconds} of the last frame. */
        void lost(String reason, double streamSeconds);

        /** Frames arrive again after {@link #lost}. */
        void back(double streamSeconds);
    }

    /** No decoded frame for this long while connected counts as a stall: the connection is dropped. */
    private static final long STALL_NANOS = 10_000_000_000L;
    /** First wait before a live source is opened again, milliseconds; it doubles per failure up to the next. */
    static final long RECONNECT_FIRST_MILLIS = 500;
    static final long RECONNECT_MAX_MILLIS = 30_000;

    private static final Logger LOG = LoggerFactory.getLogger(VideoSource.class);

    static {
        // FFmpeg's own chatter goes through SLF4J at error level only.
        av_log_set_level(AV_LOG_ERROR);
        FFmpegLog.install();
    }

    private final String cameraId;
    private final SourceOptions options;
    private final FrameSlot slot;
    private final Health health;
    private final ClipRecorder clips;
    private volatile boolean lost;
    private volatile boolean connectedOnce;
    private volatile long reconnects;
    private final CaptureMeter meter = new CaptureMeter();
    private long lastFrameNanos;
    private volatile boolean stopping;
    private volatile String fileFailure;
    private final boolean live;
    private volatile Thread runner;
    /** A two-stream camera's time link, fed with this (analysis) stream's pictures; null for one stream. */
    private volatile StreamLink link;
    /** The decoded pictures' size, pixels (0 before the first). */
    private volatile int width;
    private volatile int height;

    // stream-time bookkeeping, capture thread only
    private final StreamClock clock;
    private double nextDue;
    private volatile long frameIndex;
    private long wallStartNanos;
    private double wallStartStream;
    private volatile long decodeErrors;

    // buffers, capture thread only
    /** Analysis size, fixed by the first frame (0 before it). */
    private final Shrink shrink;
    /** The decoded frame's plane pointers and line sizes (views into the AVFrame of the current pass). */
    private PointerPointer<?> framePlanes;
    private IntPointer frameStrides;

    /** @param clips the camera's clip recorder, or null for no clips (replay) */
    public VideoSource(String cameraId, SourceOptions options, FrameSlot slot, Health health, ClipRecorder clips) {
        this.clips = clips;
        this.live = Sources.isLive(options.source());
        this.clock = new StreamClock(live, System::nanoTime);
        this.shrink = new Shrink(options.analysisWidth());
        this.cameraId = cameraId;
        this.options = options;
        this.slot = slot;
        this.health = health;
    }

    /**
     * Before {@link #run}: this is a two-stream camera's analysis stream; its pictures' times feed {@code l} so
     * that the main stream's packets can be put on this stream's time axis.
     */
    public void linkTo(StreamLink l) {
        this.link = l;
    }

    /** Width of the decoded pictures, pixels; 0 before the first. Any thread. */
    public int width() {
        return width;
    }

    /** Height of the decoded pictures, pixels; 0 before the first. Any thread. */
    public int height() {
        return height;
    }

    /** Asks the capture loop to end; it closes the slot on its way out. Any thread. */
    public void stop() {
        stopping = true;
        Thread t = runner;
        if (t != null) {
            t.interrupt();
        }
    }

    public long decodeErrors() {
        return decodeErrors;
    }

    /** Pictures decoded so far (all passes and connections). Any thread. */
    public long framesIn() {
        return frameIndex;
    }

    /** Reconnect attempts of a live source so far. Any thread. */
    public long reconnects() {
        return reconnects;
    }

    /** True while frames arrive (the camera is watching, not lost): connected once and not lost since. Any thread. */
    public boolean watching() {
        return connectedOnce && !lost;
    }

    /** CPU time of decoding and shrinking (bench). */
    public CaptureMeter meter() {
        return meter;
    }

    /** For a file that gave no frame at all: why (FFmpeg's reason); otherwise null. */
    public String fileFailure() {
        return fileFailure;
    }

    @Override
    public void run() {
        runner = Thread.currentThread();
        boolean url = Sources.isLive(options.source());
        String shown = Urls.mask(options.source());
        int passes = 0;
        Backoff backoff = new Backoff(RECONNECT_FIRST_MILLIS, RECONNECT_MAX_MILLIS);
        try {
            while (!stopping) {
                long framesBefore = frameIndex;
                String failure = null;
                try {
                    readOnce();
                } catch (InterruptedException e) {
                    break;
                } catch (Exception e) {
                    // FFmpeg's messages quote the address, password included
                    failure = e.getMessage() == null ? e.getClass().getSimpleName() : Urls.maskIn(e.getMessage());
                }
                if (stopping) {
                    break;
                }
                boolean gotFrames = frameIndex > framesBefore;
                if (!url) {
                    if (failure != null) {
                        LOG.error("camera {}: cannot read {}: {}", cameraId, shown, failure);
                        if (!gotFrames) {
                            fileFailure = failure;
                            break;
                        }
                    }
                    passes++;
                    if (!options.loop() || (options.maxLoops() > 0 && passes >= options.maxLoops())) {
                        LOG.info("camera {}: end of {} after {} frames", cameraId, shown, frameIndex);
                        break;
                    }
                    clock.nextPass();
                    continue;
                }
                if (gotFrames) {
                    backoff.reset();
                }
                if (!lost) {
                    lost = true;
                    health.lost(failure != null ? failure : (connectedOnce ? "stream ended" : "no frames"),
                            Math.max(0, clock.lastSeconds()));
                }
                long wait = backoff.nextMillis();
                LOG.warn("camera {}: stream {} {}; reconnecting in {} ms", cameraId, shown,
                        failure != null ? "failed (" + failure + ")" : "ended", wait);
                Thread.sleep(wait);
                reconnects++;
                clock.nextPass();
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } finally {
            if (clips != null) {
                clips.close();
            }
            StreamLink l = link;
            if (l != null) {
                l.analysisEnded();
            }
            slot.close();
            runner = null;
        }
    }

    /** One open–read–close pass over the source. */
    private void readOnce() throws Exception {
        FFmpegFrameGrabber grabber = VideoDecoder.grabber(options);
        VideoDecoder input = null;
        AVFrame frame = null;
        try {
            // not start(): it holds one JVM-wide lock (on avcodec's class) for the whole open, so a camera whose
            // server never answers would hold up every other camera's open until its socket timeout; FFmpeg's
            // opening is thread-safe on its own (codecs that are not lock themselves), and we open our own decoder
            grabber.startUnsafe();
            input = new VideoDecoder(grabber.getFormatContext());
            final AVCodecContext decoder = input.context;
            final int videoIndex = input.streamIndex;
            final double timeBase = input.timeBase;
            clock.opened(input.untimed, input.nominalFrameSeconds);
            StreamLink l = link;
            if (l != null) {
                l.analysisOpened();
            }
            if (clips != null) {
                if (input.raw()) {
                    LOG.info("camera {}: raw video; clips are encoded with libopenh264 (device_format = \"mjpeg\""
                            + " costs less CPU)", cameraId);
                }
                clips.onStream(input.stream.codecpar(), input.stream.time_base(), 1.0 / clock.nominalFrameSeconds());
            }
            frame = av_frame_alloc();
            // views of the frame's own plane and stride arrays, valid while it lives: no wrapper per picture
            framePlanes = frame.data();
            frameStrides = frame.linesize();
            boolean keySeen = false;
            lastFrameNanos = System.nanoTime();
            boolean network = Sources.isLive(options.source());
            wallStartNanos = System.nanoTime();
            wallStartStream = Double.NaN;
            while (!stopping) {
                AVPacket pkt = grabber.grabPacket();
                if (pkt == null) {
                    break;
                }
                if (network && System.nanoTime() - lastFrameNanos > STALL_NANOS) {
                    // packets but no pictures (other streams only, or undecodable): start over
                    av_packet_unref(pkt);
                    throw new IllegalStateException("no picture for " + STALL_NANOS / 1_000_000_000L + " s");
                }
                try {
                    if (pkt.stream_index() != videoIndex) {
                        continue;
                    }
                    // joining mid-GOP: the decoder cannot use packets before the first keyframe
                    if (!keySeen) {
                        if ((pkt.flags() & AV_PKT_FLAG_KEY) == 0) {
                            continue;
                        }
                        keySeen = true;
                    }
                    double pktSeconds = clock.packetSeconds(pkt.pts() != AV_NOPTS_VALUE ? pkt.pts() : pkt.dts(),
                            timeBase);
                    if (clips != null) {
                        clips.onPacket(pkt, pktSeconds);
                    }
                    long c0 = meter.begin();
                    int sent = avcodec_send_packet(decoder, pkt);
                    meter.decoded(c0);
                    if (sent < 0) {
                        decodeErrors++;
                        continue;
                    }
                } finally {
                    av_packet_unref(pkt);
                }
                drain(decoder, frame, timeBase);
            }
            if (!stopping) {
                avcodec_send_packet(decoder, (AVPacket) null);
                drain(decoder, frame, timeBase);
            }
        } finally {
            shrink.endPass();
            if (frame != null) {
                av_frame_free(frame);
            }
            if (input != null) {
                input.close();
            }
            try {
                grabber.close();
            } catch (Exception e) {
                LOG.debug("camera {}: close failed: {}", cameraId, e.toString());
            }
        }
    }

    private void drain(AVCodecContext decoder, AVFrame frame, double timeBase) throws InterruptedException {
        while (true) {
            long c0 = meter.begin();
            int got = avcodec_receive_frame(decoder, frame);
            meter.decoded(c0);
            if (got != 0) {
                return;
            }
            onFrame(frame, timeBase);
        }
    }

    private void onFrame(AVFrame f, double timeBase) throws InterruptedException {
        long ts = f.best_effort_timestamp();
        if (ts == AV_NOPTS_VALUE) {
            ts = f.pts();
        }
        double t = clock.frameSeconds(ts, timeBase);
        meter.frame(t);
        long index = frameIndex++;
        lastFrameNanos = System.nanoTime();
        connectedOnce = true;
        if (lost) {
            lost = false;
            health.back(t);
        }
        if (options.realtime() && !live) {
            // a file played as a camera; a live source is paced by the camera itself
            pace(t);
        }
        StreamLink l = link;
        if (l != null) {
            l.analysisFrame(System.nanoTime(), t);
        }
        double interval = 1.0 / options.analysisFps();
        if (t + 1e-6 < nextDue) {
            return;
        }
        nextDue = Math.max(nextDue + interval, t + interval * 0.5);
        int w = f.width();
        int h = f.height();
        if (w != width || h != height) {
            width = w;
            height = h;
        }
        if (w < 2 || h < 2) {
            decodeErrors++;
            return;
        }
        long c0 = meter.begin();
        GrayFrame out = shrink.into(f, framePlanes, frameStrides, slot);
        meter.downscaled(c0);
        out.streamSeconds = t;
        out.frameIndex = index;
        slot.publish();
    }

    /** Sleeps so that stream time advances no faster than wall time (a file played as a camera). */
    private void pace(double t) throws InterruptedException {
        if (Double.isNaN(wallStartStream)) {
            wallStartStream = t;
            wallStartNanos = System.nanoTime();
            return;
        }
        long dueNanos = wallStartNanos + (long) ((t - wallStartStream) * 1e9);
        long waitNanos = dueNanos - System.nanoTime();
        if (waitNanos > 1_000_000) {
            Thread.sleep(waitNanos / 1_000_000, (int) (waitNanos % 1_000_000));
        }
    }
}
