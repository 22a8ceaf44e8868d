package wayward.clip;

import static org.bytedeco.ffmpeg.global.avcodec.av_packet_free;
import static org.bytedeco.ffmpeg.global.avcodec.av_packet_rescale_ts;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_copy;
import static org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_free;
import static org.bytedeco.ffmpeg.global.avformat.AVIO_FLAG_WRITE;
import static org.bytedeco.ffmpeg.global.avformat.av_interleaved_write_frame;
import static org.bytedeco.ffmpeg.global.avformat.av_write_trailer;
import static org.bytedeco.ffmpeg.global.avformat.avformat_alloc_output_context2;
import static org.bytedeco.ffmpeg.global.avformat.avformat_free_context;
import static org.bytedeco.ffmpeg.global.avformat.avformat_new_stream;
import static org.bytedeco.ffmpeg.global.avformat.avformat_write_header;
import static org.bytedeco.ffmpeg.global.avformat.avio_closep;
import static org.bytedeco.ffmpeg.global.avformat.avio_open;
import static org.bytedeco.ffmpeg.global.avutil.AV_NOPTS_VALUE;
import static org.bytedeco.ffmpeg.global.avutil.av_make_q;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.BlockingQueue;
import java.util.concurrent.TimeUnit;
import org.bytedeco.ffmpeg.avcodec.AVCodecParameters;
import org.bytedeco.ffmpeg.avcodec.AVPacket;
import org.bytedeco.ffmpeg.avformat.AVFormatContext;
import org.bytedeco.ffmpeg.avformat.AVIOContext;
import org.bytedeco.ffmpeg.avformat.AVOutputFormat;
import org.bytedeco.ffmpeg.avformat.AVStream;
import org.bytedeco.ffmpeg.avutil.AVDictionary;
import org.bytedeco.ffmpeg.avutil.AVRational;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;

/**
 * Writes one evidence clip by stream copy (no re-encoding): the compressed packets it is handed, from a
 * keyframe on, into an MP4 whose timestamps start at 0, trailer always written. Runs on a thread of its own per
 * clip ({@link #run()}), fed through a queue by the capture thread; a packet handed over is owned by the writer,
 * which frees it; {@link #END} marks the end. The file appears under its name only once complete.
 */
public final class ClipWriter implements Runnable {
    private static final Logger LOG = LoggerFactory.getLogger(ClipWriter.class);
    /** Marker object that ends a clip's packet queue. */
    public static final AVPacket END = new AVPacket((org.bytedeco.javacpp.Pointer) null);

    private final Path file;
    private final AVCodecParameters parameters;
    private final int timeBaseNum;
    private final int timeBaseDen;
    private final BlockingQueue<AVPacket> packets;
    private final Runnable onDone;
    private final double framesPerSecond;
    private volatile int written;
    /** Clips that could not be written (disk full, no permission, ...), since start; for status and metrics. */
    private static final java.util.concurrent.atomic.AtomicLong FAILED = new java.util.concurrent.atomic.AtomicLong();

    public static long failedClips() {
        return FAILED.get();
    }

    /**
     * @param parameters copied here; the caller keeps its own
     * @param packets    clones handed over by the capture thread, ended by {@link #END}
     * @param onDone     called when the file is closed (or given up), on this writer's thread
     */
    public ClipWriter(Path file, AVCodecParameters parameters, AVRational timeBase, BlockingQueue<AVPacket> packets,
            Runnable onDone) {
        this(file, parameters, timeBase, 15, packets, onDone);
    }

    /**
     * @param framesPerSecond the stream's nominal rate; used only when raw video must be encoded (MP4 cannot
     *                        hold raw video: such clips are encoded with the FFmpeg build's libopenh264)
     */
    public ClipWriter(Path file, AVCodecParameters parameters, AVRational timeBase, double framesPerSecond,
            BlockingQueue<AVPacket> packets, Runnable onDone) {
        this.framesPerSecond = framesPerSecond > 0 && framesPerSecond < 240 ? framesPerSecond : 15;
        this.file = file;
        this.parameters = org.bytedeco.ffmpeg.global.avcodec.avcodec_parameters_alloc();
        avcodec_parameters_copy(this.parameters, parameters);
        this.timeBaseNum = timeBase.num();
        this.timeBaseDen = timeBase.den();
        this.packets = packets;
        this.onDone = onDone;
    }

    public int written() {
        return written;
    }

    @Override
    @SuppressWarnings("ReferenceEquality") // END is a sentinel: identity, not address equality
    public void run() {
        if (parameters.codec_id() == org.bytedeco.ffmpeg.global.avcodec.AV_CODEC_ID_RAWVIDEO) {
            runEncoding();
            return;
        }
        AVFormatContext oc = new AVFormatContext(null);
        boolean headerWritten = false;
        boolean opened = false;
        String temp = file + ".part";
        try {
            Files.createDirectories(file.getParent());
            check(avformat_alloc_output_context2(oc, (AVOutputFormat) null, "mp4", temp), "open MP4 muxer");
            AVStream os = avformat_new_stream(oc, null);
            check(avcodec_parameters_copy(os.codecpar(), parameters), "copy codec parameters");
            // a transport-stream tag is illegal in MP4 (CAPTURE-NOTES: error -1094995529)
            os.codecpar().codec_tag(0);
            AVRational in = av_make_q(timeBaseNum, timeBaseDen);
            os.time_base(in);
            AVIOContext pb = new AVIOContext(null);
            check(avio_open(pb, temp, AVIO_FLAG_WRITE), "create " + temp);
            oc.pb(pb);
            opened = true;
            check(avformat_write_header(oc, (AVDictionary) null), "write MP4 header");
            headerWritten = true;
            AVRational out = os.time_base();
            long offset = AV_NOPTS_VALUE;
            long lastDts = Long.MIN_VALUE;
            long lastStep = 0;
            // a gap of more than 10 s between two packets is a jump, not a pause in the picture
            long jumpTicks = Math.max(1, 10L * timeBaseDen / Math.max(1, timeBaseNum));
            boolean spliced = false;
            while (true) {
                AVPacket p = packets.poll(30, TimeUnit.SECONDS);
                if (p == null) {
                    LOG.warn("clip {}: no packet for 30 s; closing it", file.getFileName());
                    break;
                }
                if (p == END) {
                    break;
                }
                try {
                    long dts = p.dts() != AV_NOPTS_VALUE ? p.dts() : p.pts();
                    if (dts == AV_NOPTS_VALUE) {
                        continue;
                    }
                    if (offset == AV_NOPTS_VALUE) {
                        offset = dts;
                    }
                    long rebasedDts = dts - offset;
                    boolean forwardJump = lastDts != Long.MIN_VALUE && rebasedDts - lastDts > jumpTicks;
                    if (rebasedDts <= lastDts || forwardJump) {
                        // a timestamp jump (loop, reconnect, concatenated recording): splice the clip on one
                        // frame after the last packet, so the muxer gets rising timestamps
                        long step = lastStep > 0 ? lastStep : 1;
                        offset += rebasedDts - (lastDts + step);
                        rebasedDts = lastDts + step;
                        if (!spliced) {
                            LOG.info("clip {}: timestamps jump; spliced", file.getFileName());
                            spliced = true;
                        }
                    }
                    if (lastDts != Long.MIN_VALUE) {
                        lastStep = rebasedDts - lastDts;
                    }
                    lastDts = rebasedDts;
                    p.dts(rebasedDts);
                    p.pts(p.pts() != AV_NOPTS_VALUE ? p.pts() - offset : rebasedDts);
                    p.stream_index(0);
                    av_packet_rescale_ts(p, in, out);
                    check(av_interleaved_write_frame(oc, p), "write packet");
                    written++;
                } finally {
                    av_packet_free(p);
                }
            }
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } catch (Exception e) {
            failed(e);
        } finally {
            if (headerWritten) {
                av_write_trailer(oc); // without it (no moov atom) the clip does not play
            }
            if (opened) {
                avio_closep(oc.pb());
            }
            avformat_free_context(oc);
            finish(temp, headerWritten && written > 0);
        }
    }

    /** Raw video (a webcam without compression): encode the frames with libopenh264 into the MP4. */
    @SuppressWarnings("ReferenceEquality") // END is a sentinel: identity, not address equality
    private void runEncoding() {
        String temp = file + ".part";
        int w = parameters.width();
        int h = parameters.height();
        int format = parameters.format();
        boolean complete = false;
        try {
            Files.createDirectories(file.getParent());
            try (org.bytedeco.javacv.FFmpegFrameRecorder rec = new org.bytedeco.javacv.FFmpegFrameRecorder(temp, w, h, 0)) {
                rec.setFormat("mp4");
                rec.setVideoCodecName("libopenh264");
                rec.setFrameRate(framesPerSecond);
                rec.setGopSize((int) Math.round(2 * framesPerSecond));
                rec.setVideoBitrate(2_000_000);
                rec.setPixelFormat(org.bytedeco.ffmpeg.global.avutil.AV_PIX_FMT_YUV420P);
                rec.setVideoOption("threads", "1");
                rec.start();
                long offset = AV_NOPTS_VALUE;
                double secondsPerTick = (double) timeBaseNum / timeBaseDen;
                try {
                    while (true) {
                        AVPacket p = packets.poll(30, TimeUnit.SECONDS);
                        if (p == null || p == END) {
                            break;
                        }
                        try {
                            long ts = p.pts() != AV_NOPTS_VALUE ? p.pts() : p.dts();
                            int size = p.size();
                            if (ts == AV_NOPTS_VALUE || size <= 0 || size % (w * h) != 0) {
                                continue; // only packed formats (YUYV, RGB, gray): whole bytes per pixel
                            }
                            if (offset == AV_NOPTS_VALUE) {
                                offset = ts;
                            }
                            long micros = Math.round((ts - offset) * secondsPerTick * 1e6);
                            if (micros > rec.getTimestamp()) {
                                rec.setTimestamp(micros);
                            }
                            int channels = size / (w * h);
                            java.nio.ByteBuffer data = p.data().capacity(size).asByteBuffer();
                            rec.recordImage(w, h, org.bytedeco.javacv.Frame.DEPTH_UBYTE, channels, w * channels, format, data);
                            written++;
                        } finally {
                            av_packet_free(p);
                        }
                    }
                } finally {
                    rec.stop(); // writes the trailer
                }
            }
            complete = written > 0;
        } catch (InterruptedException e) {
            Thread.currentThread().interrupt();
        } catch (Exception e) {
            failed(e);
        } finally {
            finish(temp, complete);
        }
    }

    /** Counts a clip that could not be written; logs only the first, so a full disk does not flood the log. */
    private void failed(Exception e) {
        if (FAILED.incrementAndGet() == 1) {
            LOG.error("clip {} not written: {}; alerts go on; further clip failures are only counted",
                    file.getFileName(), e.getMessage());
        } else {
            LOG.debug("clip {} not written: {}", file.getFileName(), e.getMessage());
        }
    }

    /** Frees the parameters and any queued packets, puts a complete file in place (or removes it), reports. */
    private void finish(String temp, boolean complete) {
        try {
            avcodec_parameters_free(parameters);
            drain();
            if (complete) {
                Files.move(Path.of(temp), file, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
            } else {
                Files.deleteIfExists(Path.of(temp));
            }
        } catch (Exception e) {
            LOG.error("clip {}: cannot finish: {}", file.getFileName(), e.getMessage());
        }
        onDone.run();
    }

    /** Frees whatever is still queued. */
    @SuppressWarnings("ReferenceEquality") // END is a sentinel: identity, not address equality
    private void drain() {
        AVPacket p;
        while ((p = packets.poll()) != null) {
            if (p != END) {
                av_packet_free(p);
            }
        }
    }

    private static void check(int ret, String what) {
        if (ret < 0) {
            throw new IllegalStateException(what + " failed (FFmpeg error " + ret + ")");
        }
    }
}
