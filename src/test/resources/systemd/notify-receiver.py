# A receiver for systemd's notify protocol (sd_notify(3)): binds a Unix datagram socket at argv[1] and appends
# each datagram, its lines joined by '|', as one line to argv[2]. Stands in for systemd in tests.
import socket
import sys

s = socket.socket(socket.AF_UNIX, socket.SOCK_DGRAM)
s.bind(sys.argv[1])
with open(sys.argv[2], "a", buffering=1) as out:
    out.write("bound\n")
    while True:
        data = s.recv(65536)
        out.write(data.decode("utf-8").replace("\n", "|") + "\n")
