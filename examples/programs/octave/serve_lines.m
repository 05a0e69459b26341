% Answers the stepgauge-program protocol (protocol: lines) from GNU Octave: one JSON request per
% line on stdin, one JSON response per line on stdout, until stdin closes. The model is the
% MATLAB-style function two_body_rhs.m; the integrator is Octave's ode45 (Dormand-Prince 5(4)),
% asked for its own steps only (Refine 1), with the request's rtol and atol.
%   octave-cli --no-gui --quiet serve_lines.m
1;
addpath (fileparts (mfilename ("fullpath")));  % the model function sits beside this script
while true
  % input() returns as soon as a line arrives; fgetl (stdin) on a pipe waits for more input.
  try
    line = input ("", "s");
  catch
    break;  % end of input: the sweep is over
  end
  if (isempty (strtrim (line)))
    continue;
  end
  try
    req = jsondecode (line);
    p = req.problem;
    mu = 1;
    if (isfield (p.parameters, "mu"))
      mu = p.parameters.mu;
    end
    opts = odeset ("RelTol", req.setting.rtol, "AbsTol", req.setting.atol, "Refine", 1);
    started = tic ();
    [t, y] = ode45 (@(t, y) two_body_rhs (t, y, mu), [p.t0, p.tEnd], p.y0(:), opts);
    seconds = toc (started);
    resp = struct ("status", "ok", "times", t(:)', "states", y, "seconds", seconds);
  catch err
    resp = struct ("status", "error", "message", err.message);
  end
  fputs (stdout, [jsonencode(resp) "\n"]);
  fflush (stdout);
end
