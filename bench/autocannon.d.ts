// The part of autocannon's API that bench/http.ts uses (the package ships no types).
declare module 'autocannon' {
  interface Options {
    url: string
    connections?: number
    duration?: number
    pipelining?: number
  }
  interface Result {
    requests: { average: number }
    non2xx: number
    errors: number
    timeouts: number
  }
  export default function autocannon(options: Options): Promise<Result>
}
