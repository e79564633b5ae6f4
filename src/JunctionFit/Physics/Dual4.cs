namespace JunctionFit.Physics;

/// <summary>
/// A forward-mode dual number with four partial derivatives: value v and ∂v/∂θ₀..∂v/∂θ₃. Arithmetic follows the chain rule
/// exactly, so derivatives of closed-form expressions are analytic to rounding. A value type: no allocation.
/// </summary>
internal readonly struct Dual4
{
    public readonly double V, D0, D1, D2, D3;

    public Dual4(double v, double d0 = 0, double d1 = 0, double d2 = 0, double d3 = 0)
    {
        V = v; D0 = d0; D1 = d1; D2 = d2; D3 = d3;
    }

    /// <summary>The independent variable number <paramref name="index"/> with value <paramref name="v"/>.</summary>
    public static Dual4 Variable(double v, int index) => index switch
    {
        0 => new Dual4(v, 1, 0, 0, 0),
        1 => new Dual4(v, 0, 1, 0, 0),
        2 => new Dual4(v, 0, 0, 1, 0),
        3 => new Dual4(v, 0, 0, 0, 1),
        _ => throw new ArgumentOutOfRangeException(nameof(index)),
    };

    public double Partial(int index) => index switch { 0 => D0, 1 => D1, 2 => D2, 3 => D3, _ => throw new ArgumentOutOfRangeException(nameof(index)) };

    private Dual4 Chain(double value, double derivative) => new(value, derivative * D0, derivative * D1, derivative * D2, derivative * D3);

    public static implicit operator Dual4(double v) => new(v);

    public static Dual4 operator +(Dual4 a, Dual4 b) => new(a.V + b.V, a.D0 + b.D0, a.D1 + b.D1, a.D2 + b.D2, a.D3 + b.D3);

    public static Dual4 operator -(Dual4 a, Dual4 b) => new(a.V - b.V, a.D0 - b.D0, a.D1 - b.D1, a.D2 - b.D2, a.D3 - b.D3);

    public static Dual4 operator -(Dual4 a) => new(-a.V, -a.D0, -a.D1, -a.D2, -a.D3);

    public static Dual4 operator *(Dual4 a, Dual4 b)
        => new(a.V * b.V, a.D0 * b.V + a.V * b.D0, a.D1 * b.V + a.V * b.D1, a.D2 * b.V + a.V * b.D2, a.D3 * b.V + a.V * b.D3);

    public static Dual4 operator /(Dual4 a, Dual4 b)
    {
        double inv = 1.0 / b.V, q = a.V * inv;
        return new(q, (a.D0 - q * b.D0) * inv, (a.D1 - q * b.D1) * inv, (a.D2 - q * b.D2) * inv, (a.D3 - q * b.D3) * inv);
    }

    public static Dual4 Sqrt(Dual4 a)
    {
        double s = Math.Sqrt(a.V);
        return a.Chain(s, s > 0 ? 0.5 / s : 0.0);
    }

    public static Dual4 Exp(Dual4 a)
    {
        double e = Math.Exp(a.V);
        return a.Chain(e, e);
    }

    public static Dual4 Log(Dual4 a) => a.Chain(Math.Log(a.V), 1.0 / a.V);

    /// <summary>max(a, floor) with a zero derivative where the floor applies.</summary>
    public static Dual4 AtLeast(Dual4 a, double floor) => a.V >= floor ? a : new Dual4(floor);
}
