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
    public void run() {
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
                    if (rebasedDts <= lastDts) {
                        // a timestamp jump (loop, reconnect): the muxer would refuse the rest; end the clip here
                        LOG.info("clip {}: timestamps jump back; clip ends there", file.getFileName());
                        drain();
                        break;
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
            // one line for the first failure, then only a count (a full disk would otherwise flood the log)
            if (FAILED.incrementAndGet() == 1) {
                LOG.error("clip {} not written: {}; alerts go on; further clip failures are only counted",
                        file.getFileName(), e.getMessage());
            } else {
                LOG.debug("clip {} not written: {}", file.getFileName(), e.getMessage());
            }
        } finally {
            try {
                if (headerWritten) {
                    av_write_trailer(oc); // without it (no moov atom) the clip does not play
                }
                if (opened) {
                    avio_closep(oc.pb());
                }
                avformat_free_context(oc);
                avcodec_parameters_free(parameters);
                drain();
                if (headerWritten && written > 0) {
                    Files.move(Path.of(temp), file, java.nio.file.StandardCopyOption.ATOMIC_MOVE);
                } else {
                    Files.deleteIfExists(Path.of(temp));
                }
            } catch (Exception e) {
                LOG.error("clip {}: cannot finish: {}", file.getFileName(), e.getMessage());
            }
            onDone.run();
        }
    }

    /** Frees whatever is still queued. */
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
