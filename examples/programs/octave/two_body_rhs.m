function dy = two_body_rhs (t, y, mu)
  % Point-mass gravity in state-space form: y = [positions; velocities], dy = [velocities; accelerations].
  % A MATLAB-style model function as users write them; it runs unchanged in GNU Octave.
  dim = numel (y) / 2;
  r = y(1:dim);
  a = -mu * r / norm (r)^3;
  dy = [y(dim+1:end); a];
end
