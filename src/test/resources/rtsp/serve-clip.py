#!/usr/bin/python3
"""A loopback RTSP server for the integration tests: serves one MP4 clip (H.264) without re-encoding, looped
forever, at rtsp://127.0.0.1:PORT/clip. GStreamer's RTSP server through Python GObject introspection (Debian
packages python3-gi, gir1.2-gst-rtsp-server-1.0 and the GStreamer plugins). Usage: serve-clip.py PORT CLIP"""
import sys

import gi

gi.require_version("Gst", "1.0")
gi.require_version("GstRtspServer", "1.0")
from gi.repository import GLib, Gst, GstRtspServer  # noqa: E402


class LoopingFactory(GstRtspServer.RTSPMediaFactory):
    def __init__(self, clip):
        super().__init__()
        self.clip = clip
        self.set_shared(True)

    def do_create_element(self, url):
        launch = ("( filesrc location=%s ! qtdemux ! h264parse config-interval=-1 ! rtph264pay name=pay0 pt=96 )"
                  % self.clip)
        return Gst.parse_launch(launch)

    def do_configure(self, media):
        media.connect("prepared", self.on_prepared)

    def on_prepared(self, media):
        pipeline = media.get_element()
        bus = pipeline.get_bus()
        bus.add_signal_watch()

        def on_message(_bus, message):
            # loop by segment seeks: at the segment's end seek back to 0 without flushing
            if message.type == Gst.MessageType.SEGMENT_DONE:
                pipeline.seek_simple(Gst.Format.TIME, Gst.SeekFlags.SEGMENT, 0)
        bus.connect("message", on_message)
        pipeline.seek_simple(Gst.Format.TIME, Gst.SeekFlags.FLUSH | Gst.SeekFlags.SEGMENT, 0)


def main():
    port, clip = sys.argv[1], sys.argv[2]
    Gst.init(None)
    server = GstRtspServer.RTSPServer()
    server.set_address("127.0.0.1")
    server.set_service(port)
    server.get_mount_points().add_factory("/clip", LoopingFactory(clip))
    if server.attach(None) == 0:
        # the port could not be bound (taken since it was picked): say so, so that the test does not wait on a
        # server that is not there
        print("cannot listen on 127.0.0.1:%s" % port, flush=True)
        sys.exit(1)
    print("serving rtsp://127.0.0.1:%s/clip" % port, flush=True)
    GLib.MainLoop().run()


if __name__ == "__main__":
    main()
